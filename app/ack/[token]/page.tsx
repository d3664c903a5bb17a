// The public page an acknowledge link in a mail opens. Opening it changes nothing (mail scanners
// fetch links): it shows what will be acknowledged, and the button confirms.
import type { Metadata } from "next";
import Link from "next/link";
import { and, eq } from "drizzle-orm";
import { CircleCheck, Eye, TriangleAlert } from "lucide-react";
import { getDb } from "@/db/client";
import { incidents, sites, tanks, usedTokens, users } from "@/db/schema";
import { verifyAckToken } from "@/ingest/alerts/ack-link";
import { describeCause, type Cause } from "@/lib/alerts";
import { formatDateTime } from "@/lib/display/time";
import { Logo } from "@/components/logo";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { IncidentStateBadge } from "@/components/incidents/state";
import { confirmAcknowledge } from "./actions";

export const metadata: Metadata = { title: "Acknowledge incident", robots: { index: false } };
export const dynamic = "force-dynamic";

function Shell({ children }: { children: React.ReactNode }) {
  return (
    <main className="mx-auto flex min-h-dvh max-w-lg flex-col justify-center gap-6 p-4">
      <Logo />
      {children}
    </main>
  );
}

function Notice({ icon: Icon, title, children }: { icon: typeof Eye; title: string; children: React.ReactNode }) {
  return (
    <Shell>
      <Card className="p-6" data-ack-notice={title}>
        <h1 className="flex items-center gap-2 text-xl font-semibold">
          <Icon className="size-5" aria-hidden /> {title}
        </h1>
        <div className="mt-2 space-y-2 text-sm text-ink-soft">{children}</div>
        <p className="mt-4 text-sm">
          <Link href="/incidents" className="font-medium text-accent-700 hover:underline">
            Sign in to see incidents
          </Link>
        </p>
      </Card>
    </Shell>
  );
}

export default async function AcknowledgePage({ params, searchParams }: { params: Promise<{ token: string }>; searchParams: Promise<{ outcome?: string }> }) {
  const { token } = await params;
  const { outcome } = await searchParams;
  const checked = await verifyAckToken(token);
  if (!checked.ok) {
    return (
      <Notice icon={TriangleAlert} title={checked.reason === "expired" ? "This link has expired" : "This link is not valid"}>
        <p>Acknowledge links work for 24 hours after the mail was sent. Sign in to acknowledge the incident from Tidewell instead.</p>
      </Notice>
    );
  }
  const db = getDb();
  const { claims } = checked;
  const [row] = await db
    .select({ incident: incidents, tankName: tanks.name, siteName: sites.name })
    .from(incidents)
    .innerJoin(tanks, eq(tanks.id, incidents.tankId))
    .innerJoin(sites, eq(sites.id, incidents.siteId))
    .innerJoin(users, and(eq(users.id, claims.userId), eq(users.orgId, incidents.orgId)))
    .where(eq(incidents.id, claims.incidentId));
  if (!row) {
    return (
      <Notice icon={TriangleAlert} title="This incident was not found">
        <p>It may have been removed, or the account the mail was sent to no longer has access.</p>
      </Notice>
    );
  }
  const i = row.incident;
  const [used] = await db.select().from(usedTokens).where(eq(usedTokens.jti, claims.jti));
  const by = i.acknowledgedBy ? (await db.select({ name: users.name }).from(users).where(eq(users.id, i.acknowledgedBy)))[0]?.name : null;
  const summary = (
    <div className="mt-4 space-y-1 rounded-md border border-paper-line bg-paper p-3 text-sm">
      <p className="flex items-center justify-between gap-2 font-semibold">
        {row.tankName} · {describeCause(i.cause as Cause)} <IncidentStateBadge state={i.state} />
      </p>
      <p>{i.message}</p>
      <p className="num text-xs text-ink-soft">
        {row.siteName} · opened {formatDateTime(i.openedAt)}
      </p>
    </div>
  );

  if (used || i.state !== "open") {
    const mine = used && outcome === "done";
    return (
      <Shell>
        <Card className="p-6" data-ack-result={mine ? "acknowledged" : i.state}>
          <h1 className="flex items-center gap-2 text-xl font-semibold">
            <CircleCheck className="size-5 text-ok" aria-hidden />
            {mine ? "Acknowledged — thank you" : i.state === "resolved" ? "This incident is already resolved" : "This incident is already acknowledged"}
          </h1>
          {by && i.acknowledgedAt ? (
            <p className="mt-2 text-sm text-ink-soft">
              Acknowledged by {by} at {formatDateTime(i.acknowledgedAt)}.
            </p>
          ) : null}
          {summary}
          <p className="mt-4 text-sm text-ink-soft">Alerts are an aid, not a substitute for walking the tanks.</p>
        </Card>
      </Shell>
    );
  }

  return (
    <Shell>
      <Card className="p-6">
        <h1 className="text-xl font-semibold">Acknowledge this incident?</h1>
        <p className="mt-1 text-sm text-ink-soft">Acknowledging tells everyone on shift that you are looking at the tank. It stops the escalation to the owner.</p>
        {summary}
        {outcome === "conflict" ? <p className="mt-3 text-sm text-bad">Someone acknowledged it a moment ago, or this link was already used.</p> : null}
        <form action={confirmAcknowledge.bind(null, token)} className="mt-5">
          <Button type="submit" size="lg" className="w-full">
            <Eye className="size-5" aria-hidden /> Acknowledge
          </Button>
        </form>
        <p className="mt-3 text-xs text-ink-faint">The link works once and expires 24 hours after the mail was sent.</p>
      </Card>
    </Shell>
  );
}
