"use client";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { BellRing, FlaskConical, LayoutGrid, Mail, Settings, Cylinder } from "lucide-react";
import { cn } from "@/components/ui/cn";
import type { NavItem } from "./nav-items";

const ICONS = { wall: LayoutGrid, tanks: Cylinder, calibrations: FlaskConical, incidents: BellRing, settings: Settings, mailbox: Mail };

function isActive(pathname: string, href: string) {
  return href === "/" ? pathname === "/" : pathname === href || pathname.startsWith(`${href}/`);
}

export function SideNav({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Main" className="flex flex-col gap-1">
      {items.map((item) => {
        const Icon = ICONS[item.icon];
        const active = isActive(pathname, item.href);
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={active ? "page" : undefined}
            className={cn(
              "flex h-11 items-center gap-3 rounded-md px-3 text-sm font-medium",
              active ? "bg-accent-700 text-white" : "text-ink-soft hover:bg-paper-sunk hover:text-ink",
            )}
          >
            <Icon className="size-5" aria-hidden />
            {item.label}
          </Link>
        );
      })}
    </nav>
  );
}

/** Phone: a bottom bar with large targets (usable in a wet glove). */
export function BottomNav({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Main" className="fixed inset-x-0 bottom-0 z-30 grid border-t border-paper-line bg-paper-raised lg:hidden" style={{ gridTemplateColumns: `repeat(${items.length}, minmax(0, 1fr))` }}>
      {items.map((item) => {
        const Icon = ICONS[item.icon];
        const active = isActive(pathname, item.href);
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={active ? "page" : undefined}
            className={cn("flex h-16 flex-col items-center justify-center gap-1 text-[11px] font-medium", active ? "text-accent-700" : "text-ink-soft")}
          >
            <Icon className="size-6" aria-hidden />
            <span className="truncate">{item.label.replace("Demo ", "")}</span>
          </Link>
        );
      })}
    </nav>
  );
}
