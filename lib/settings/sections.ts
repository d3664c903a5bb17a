// The sections of Settings and who may open each (DESIGN.md roles: night managers only their preferences).
import type { Role } from "../../db/schema";

export interface SettingsSection {
  key: "users" | "sites" | "tanks" | "probes" | "devices" | "preferences" | "audit" | "exports" | "labels";
  href: string;
  title: string;
  description: string;
  roles: readonly Role[];
}

export const SETTINGS_SECTIONS: SettingsSection[] = [
  { key: "users", href: "/settings/users", title: "Organisation & users", description: "Farm name, invitations, roles and deactivation", roles: ["owner"] },
  { key: "sites", href: "/settings/sites", title: "Sites & zones", description: "Time zone, shift hours, escalation, calibration and hold limits", roles: ["owner"] },
  { key: "tanks", href: "/settings/tanks", title: "Tanks", description: "Crop, target bands, temperature coefficient, spot-check tolerance, calibration interval", roles: ["owner", "grower"] },
  { key: "probes", href: "/settings/probes", title: "Probes", description: "Add, move, retire and replace pH, EC and temperature probes", roles: ["owner", "grower"] },
  { key: "labels", href: "/settings/labels", title: "Labels", description: "Printable QR labels for tanks and probes: scan to open a tank or calibrate a probe", roles: ["owner", "grower"] },
  { key: "devices", href: "/settings/devices", title: "Devices", description: "Tank controllers and their MQTT credentials", roles: ["owner"] },
  { key: "preferences", href: "/settings/preferences", title: "Preferences", description: "Your EC unit, notification e-mail and wall sound", roles: ["owner", "grower", "night_manager"] },
  { key: "audit", href: "/settings/audit", title: "Audit log", description: "Who changed what and when", roles: ["owner"] },
  { key: "exports", href: "/settings/exports", title: "Exports", description: "Readings and calibration records as CSV", roles: ["owner"] },
];

export function sectionsFor(role: Role): SettingsSection[] {
  return SETTINGS_SECTIONS.filter((s) => s.roles.includes(role));
}

export function maySee(role: Role, key: SettingsSection["key"]): boolean {
  return SETTINGS_SECTIONS.some((s) => s.key === key && s.roles.includes(role));
}
