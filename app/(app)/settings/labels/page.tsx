import type { Metadata } from "next";
import Link from "next/link";
import { headers } from "next/headers";
import { eq } from "drizzle-orm";
import QRCode from "qrcode";
import { getDb } from "@/db/client";
import { sites, tanks as tankTable } from "@/db/schema";
import { tankOverview } from "@/db/queries/overview";
import { Card, PageHeader } from "@/components/ui/card";
import { LabelSheet, type LabelData } from "@/components/labels/label-sheet";
import { PrintButton } from "@/components/labels/print-button";
import { LABEL_FORMATS, labelUrl, type LabelFormat } from "@/lib/labels/links";
import { userForSection } from "../section-access";

export const metadata: Metadata = { title: "Labels" };
export const dynamic = "force-dynamic";

const KIND = { ph: "pH probe", ec: "EC probe", temp: "Temperature probe" } as const;

/** Where the app is reached: APP_URL, else the address this page was asked for. */
async function appBase(): Promise<string> {
  if (process.env.APP_URL) return process.env.APP_URL;
  const h = await headers();
  return `${h.get("x-forwarded-proto") ?? "http"}://${h.get("host") ?? "127.0.0.1:3000"}`;
}

async function qrSvg(url: string): Promise<string> {
  return QRCode.toString(url, { type: "svg", errorCorrectionLevel: "M", margin: 1, color: { dark: "#000000", light: "#ffffff" } });
}

export default async function LabelsPage({ searchParams }: { searchParams: Promise<{ site?: string; format?: string }> }) {
  const user = await userForSection("labels");
  const sp = await searchParams;
  const db = getDb();
  const siteRows = await db.select({ id: sites.id, name: sites.name }).from(sites).where(eq(sites.orgId, user.orgId)).orderBy(sites.name);
  const site = siteRows.find((s) => s.id === Number(sp.site)) ?? siteRows[0];
  const format: LabelFormat = sp.format === "roll" ? "roll" : "a4";
  const base = await appBase();
  const tanks = site ? await tankOverview(db, user.orgId, { siteId: site.id }) : [];
  // A tank's label names its controller, the identifier written on the hardware beside it.
  const controllers = site ? new Map((await db.select({ id: tankTable.id, controllerId: tankTable.controllerId }).from(tankTable).where(eq(tankTable.siteId, site.id))).map((t) => [t.id, t.controllerId])) : new Map<number, string | null>();
  const labels: LabelData[] = [];
  for (const t of tanks) {
    labels.push({ key: `tank-${t.id}`, kind: "tank", id: t.id, heading: "Tank", name: t.name, serial: controllers.get(t.id) ?? t.zoneName ?? t.crop, site: t.siteName, action: "Scan to open the tank", url: labelUrl(base, "tank", t.id), svg: await qrSvg(labelUrl(base, "tank", t.id)) });
    for (const p of t.probes) {
      const url = labelUrl(base, "probe", p.id);
      labels.push({ key: `probe-${p.id}`, kind: "probe", id: p.id, heading: KIND[p.kind], name: t.name, serial: p.serial, site: t.siteName, action: p.kind === "temp" ? "Scan for the probe's record" : "Scan to calibrate", url, svg: await qrSvg(url) });
    }
  }
  const choice = (s: number, f: LabelFormat) => `/settings/labels?site=${s}&format=${f}`;
  const pill = (active: boolean) => `inline-flex h-11 items-center rounded-md border px-4 text-sm font-medium ${active ? "border-accent-700 bg-accent-50 text-accent-800" : "border-paper-line bg-paper-raised hover:bg-paper-sunk"}`;
  return (
    <>
      <div data-print="hide">
        <PageHeader title="Labels" subtitle="QR labels for the tanks and probes of a site; a phone's camera opens the tank or starts (or resumes) the probe's calibration after sign-in" actions={<PrintButton />} />
        <Card className="mb-5 flex flex-wrap items-center gap-x-6 gap-y-3 p-4">
          <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Site">
            <span className="text-sm text-ink-soft">Site</span>
            {siteRows.map((s) => (
              <Link key={s.id} href={choice(s.id, format)} className={pill(s.id === site?.id)} aria-current={s.id === site?.id ? "true" : undefined}>
                {s.name}
              </Link>
            ))}
          </div>
          <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Format">
            <span className="text-sm text-ink-soft">Format</span>
            {(Object.keys(LABEL_FORMATS) as LabelFormat[]).map((f) => (
              <Link key={f} href={site ? choice(site.id, f) : "#"} className={pill(f === format)} aria-current={f === format ? "true" : undefined}>
                {LABEL_FORMATS[f].title}
              </Link>
            ))}
          </div>
        </Card>
        <p className="mb-4 text-sm text-ink-soft">
          {labels.length} labels. Print at 100 % scale (no &ldquo;fit to page&rdquo;). Labels near nutrient tanks get wet: use water-resistant label stock, and keep them clear of
          electrical connections.
        </p>
      </div>
      <LabelSheet labels={labels} format={format} />
    </>
  );
}
