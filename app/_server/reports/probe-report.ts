// The calibration record of one probe over a period, as a PDF: every finished run with its points
// (buffer or standard, lot and expiry, temperature, signal, expected value), the fitted slope and
// offset or cell constant, the verdict with its reasons, and who did it.
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { organisations } from "@/db/schema";
import { probeRecord } from "@/db/queries/calibration-history";
import { standardLabel } from "@/lib/calibration";
import { fmt } from "@/lib/calibration/format";
import { RUN_STATUS_WORD, asFoundText, reportDate, reportDateTime, reportFilename, runResultText, type ReportPeriod } from "@/lib/reports/format";
import { COLOR, REPORT_LIMITS, contentWidth, ensureSpace, newReport, paragraph, sectionHeading, table, verdictTag, type Doc } from "./pdf";

const KIND_NAME = { ph: "pH", ec: "EC", temp: "Temperature" } as const;
const LIFECYCLE = { active: "In service", replace: "Marked for replacement", retired: "Retired" } as const;
const STATUS_WORD = { current: "Current", "due-soon": "Due soon", lapsed: "Lapsed", never: "Never calibrated", "not-needed": "Not calibrated (temperature)" } as const;

type Record = Awaited<ReturnType<typeof probeRecord>>;
type Run = Record["runs"][number];

/** The runs a probe report lists: finished runs started within the period, oldest first. */
export function runsInPeriod(runs: Run[], period: ReportPeriod): Run[] {
  return runs.filter((r) => r.status !== "in_progress" && r.startedAt >= period.startMs && r.startedAt < period.endMs).sort((a, b) => a.startedAt - b.startedAt || a.id - b.id);
}

export async function probeReportPdf(db: Db, user: { orgId: number; name: string }, probeId: number, period: ReportPeriod, now: number): Promise<{ pdf: Buffer; filename: string }> {
  const record = await probeRecord(db, user.orgId, probeId, now);
  const [org] = await db.select({ name: organisations.name }).from(organisations).where(eq(organisations.id, user.orgId));
  const { probe, tank, site } = record;
  const [siteRow] = await db.query.sites.findMany({ where: (s, { eq: e }) => e(s.id, site.id), columns: { timeZone: true } });
  const tz = siteRow?.timeZone ?? "UTC";
  const runs = runsInPeriod(record.runs, period);
  const { doc, finish } = newReport({
    title: `${KIND_NAME[probe.kind]} probe ${probe.serial}`,
    subtitle: `Calibration record, ${reportDate(period.from)} to ${reportDate(period.to)}`,
    facts: [
      ["Organisation", org?.name ?? "—"],
      ["Site · tank", `${site.name} · ${tank.name} (${tank.crop})`],
      ["Probe", `${KIND_NAME[probe.kind]} ${probe.serial}${probe.nominalCellConstant ? ` · nominal cell constant ${fmt(probe.nominalCellConstant, 2)} /cm` : ""}`],
      ["Lifecycle", `${LIFECYCLE[probe.status]} · installed ${reportDateTime(probe.installedAt, tz)}`],
      ["Status now", `${STATUS_WORD[record.status]} · last accepted ${reportDateTime(record.lastAccepted?.effectiveAt, tz)} · due ${reportDateTime(record.dueAt, tz)}`],
      ["Interval", `${record.intervalDays} days (tank's interval, capped by the site's maximum of ${site.maxCalibrationIntervalDays})`],
      ["Times", `${tz}, 24-hour clock`],
      ["Generated", `${reportDateTime(now, tz)} by ${user.name}`],
    ],
    footerNote: `Tidewell · ${KIND_NAME[probe.kind]} probe ${probe.serial} · ${tank.name}, ${site.name}. ${REPORT_LIMITS}`,
  });

  const counts = { accepted: 0, rejected: 0, abandoned: 0 };
  for (const r of runs) if (r.status in counts) counts[r.status as keyof typeof counts]++;
  sectionHeading(doc, "Summary");
  paragraph(
    doc,
    runs.length
      ? `${runs.length} run${runs.length === 1 ? "" : "s"} in the period: ${counts.accepted} accepted, ${counts.rejected} rejected, ${counts.abandoned} abandoned.`
      : "No calibration runs were finished on this probe in the period.",
  );
  if (probe.status === "replace") paragraph(doc, "This probe is marked for replacement: it was rejected twice in a row.", { font: "medium", color: COLOR.bad });

  for (const run of runs) runSection(doc, run, probe.kind, tz);
  return { pdf: await finish(), filename: reportFilename(probe.serial, period) };
}

function runSection(doc: Doc, run: Run, kind: "ph" | "ec" | "temp", tz: string) {
  ensureSpace(doc, 120);
  doc.moveDown(0.9);
  const x = doc.page.margins.left;
  const w = contentWidth(doc);
  const y = doc.y;
  doc.moveTo(x, y).lineTo(x + w, y).lineWidth(1.2).stroke(COLOR.accent);
  doc.font("bold").fontSize(11).fillColor(COLOR.ink).text(`Run ${run.id} · ${reportDateTime(run.startedAt, tz)}`, x, y + 7, { lineBreak: false });
  verdictTag(doc, x + w - 90, y + 6, run.status);
  doc.y = y + 25;
  const who = run.userName ?? "unknown user";
  const how = run.source === "guided" ? "Guided run" : "Entered from a record made elsewhere";
  paragraph(doc, `${how} by ${who} · ${RUN_STATUS_WORD[run.status]} ${reportDateTime(run.completedAt, tz)}${run.effectiveAt ? ` · in force from ${reportDateTime(run.effectiveAt, tz)}` : ""}`, { color: COLOR.soft, size: 8.5 });
  if (run.status !== "abandoned") {
    const asFound = asFoundText(run);
    paragraph(doc, `${runResultText(run)}${asFound ? ` · ${asFound}` : ""}`, { font: "medium", size: 10.5 });
  }
  if (run.reasons.length) {
    doc.moveDown(0.2);
    for (const reason of run.reasons) paragraph(doc, `• ${reason}`, { size: 9, indent: 6, color: run.status === "rejected" ? COLOR.bad : COLOR.ink });
  }
  if (run.note) paragraph(doc, `Note: ${run.note}`, { size: 9, color: COLOR.soft });
  if (run.upload) paragraph(doc, `Attached record: ${run.upload.filename}`, { size: 8.5, color: COLOR.soft });
  if (!run.points.length) return;
  doc.moveDown(0.4);
  const signal = kind === "ec" ? "Signal µS" : "Signal mV";
  const expected = kind === "ec" ? "Std µS/cm" : "Buffer pH";
  table(
    doc,
    [
      { title: "#", width: 0.04 },
      { title: "Step", width: 0.08 },
      { title: "Buffer / standard", width: 0.18 },
      { title: "Lot", width: 0.15, mono: true },
      { title: "Expires", width: 0.12 },
      { title: "Temp °C", width: 0.09, align: "right" },
      { title: signal, width: 0.12, align: "right" },
      { title: expected, width: 0.11, align: "right" },
      { title: "Captured", width: 0.11, align: "right" },
    ],
    run.points.map((p) => [
      String(p.seq),
      p.purpose === "as_found" ? "As-found" : "Point",
      standardLabel(p.standard),
      p.lot ?? "—",
      p.expiresOn ?? "—",
      `${fmt(p.tempC, 1)}${p.tempSource === "typed" ? " typed" : ""}`,
      p.mv !== null ? fmt(p.mv, 1) : p.conductanceUs !== null ? fmt(p.conductanceUs, 1) : "—",
      p.expected === null ? "—" : kind === "ec" ? fmt(p.expected, 0) : fmt(p.expected, 3),
      `${reportDateTime(p.capturedAt, tz).slice(-5)}${p.stable ? "" : " (unsettled)"}`,
    ]),
  );
  for (const p of run.points.filter((q) => q.note)) paragraph(doc, `Point ${p.seq}: ${p.note}`, { size: 8.5, color: COLOR.soft });
}
