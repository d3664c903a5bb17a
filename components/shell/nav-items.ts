import type { Role } from "@/db/schema";

export interface NavItem {
  href: string;
  label: string;
  icon: "wall" | "tanks" | "calibrations" | "incidents" | "settings" | "mailbox";
  roles: readonly Role[];
  demoOnly?: boolean;
}

export const NAV_ITEMS: NavItem[] = [
  { href: "/", label: "Tank wall", icon: "wall", roles: ["owner", "grower", "night_manager"] },
  { href: "/tanks", label: "Tanks", icon: "tanks", roles: ["owner", "grower", "night_manager"] },
  { href: "/calibrations", label: "Calibrations", icon: "calibrations", roles: ["owner", "grower", "night_manager"] },
  { href: "/incidents", label: "Incidents", icon: "incidents", roles: ["owner", "grower", "night_manager"] },
  { href: "/settings", label: "Settings", icon: "settings", roles: ["owner", "grower", "night_manager"] },
  { href: "/mailbox", label: "Demo mailbox", icon: "mailbox", roles: ["owner"], demoOnly: true },
];

export function navFor(role: Role, demo: boolean): NavItem[] {
  return NAV_ITEMS.filter((i) => i.roles.includes(role) && (!i.demoOnly || demo));
}
