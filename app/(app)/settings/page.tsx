import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { ChevronRight } from "lucide-react";
import { currentUser } from "@/app/_server/session";
import { Card, PageHeader } from "@/components/ui/card";
import { sectionsFor } from "@/lib/settings/sections";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const user = (await currentUser())!;
  const sections = sectionsFor(user.role);
  // Night managers have one section: their own preferences.
  if (sections.length === 1) redirect(sections[0].href);
  return (
    <>
      <PageHeader title="Settings" subtitle="Set up your farm: people, sites, tanks, probes and controllers" />
      <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
        {sections.map((s) => (
          <Link key={s.key} href={s.href} className="group">
            <Card className="flex h-full items-start justify-between gap-3 p-4 group-hover:border-accent-600">
              <div>
                <h2 className="font-semibold">{s.title}</h2>
                <p className="mt-1 text-sm text-ink-soft">{s.description}</p>
              </div>
              <ChevronRight className="mt-0.5 size-5 shrink-0 text-ink-faint group-hover:text-accent-700" aria-hidden />
            </Card>
          </Link>
        ))}
      </div>
    </>
  );
}
