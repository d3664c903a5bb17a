"use client";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { cn } from "@/components/ui/cn";

export function SettingsTabs({ sections }: { sections: { href: string; title: string }[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Settings" className="-mx-4 mb-5 overflow-x-auto border-b border-paper-line px-4 lg:mx-0 lg:px-0">
      <ul className="flex min-w-max gap-1">
        <li>
          <Link href="/settings" aria-current={pathname === "/settings" ? "page" : undefined} className={tab(pathname === "/settings")}>
            Overview
          </Link>
        </li>
        {sections.map((s) => {
          const active = pathname === s.href || pathname.startsWith(`${s.href}/`);
          return (
            <li key={s.href}>
              <Link href={s.href} aria-current={active ? "page" : undefined} className={tab(active)}>
                {s.title}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}

function tab(active: boolean) {
  return cn("flex h-11 items-center border-b-2 px-3 text-sm font-medium", active ? "border-accent-700 text-ink" : "border-transparent text-ink-soft hover:text-ink");
}
