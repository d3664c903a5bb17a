// A site's calibration report, as a PDF: compliance now, overdue probes, probes marked for
// replacement, runs per month and every run finished in the period.
import type { Db } from "@/db/client";
import { siteReportData, type SiteReportData } from "@/db/queries/calibration-report";
import { RUN_STATUS_WORD, reportDate, reportDateTime, reportFilename, runResultText, type ReportPeriod } from "@/lib/reports/format";
import { COLOR, REPORT_LIMITS, contentWidth, ensureSpace, keyValueGrid, newReport, paragraph, sectionHeading, table, type Doc } from "./pdf";

const KIND = { ph: "pH", ec: "EC", temp: "Temp" } as const;
const STATUS = { lapsed: "Lapsed", never: "Never calibrated" } as const;

export async function siteReportPdf(db: Db, user: { orgId: number; name: string }, siteId: number, period: ReportPeriod, now: number): Promise<{ pdf: Buffer; filename: string }> {
  const data = await siteReportData(db, user.orgId, siteId, period, now);
  const tz = data.site.timeZone;
  const { doc, finish } = newReport({
    title: `${data.site.name}`,
    subtitle: `Calibration compliance, ${reportDate(period.from)} to ${reportDate(period.to)}`,
    facts: [
      ["Organisation", data.org.name],
      ["Site", `${data.site.name} · ${data.tanks} tanks · ${data.probes} pH and EC probes`],
      ["Maximum interval", `${data.site.maxCalibrationIntervalDays} days`],
      ["Times", `${tz}, 24-hour clock`],
      ["Generated", `${reportDateTime(now, tz)} by ${user.name}`],
      ["Status as of", reportDateTime(now, tz)],
    ],
    footerNote: `Tidewell · calibration compliance · ${data.site.name}. ${REPORT_LIMITS}`,
  });

  sectionHeading(doc, "Compliance now");
  shareBlock(doc, data);
  keyValueGrid(
    doc,
    [
      ["Current", String(data.byStatus.current)],
      ["Due soon", String(data.byStatus["due-soon"])],
      ["Lapsed", String(data.byStatus.lapsed)],
      ["Never calibrated", String(data.byStatus.never)],
    ],
    4,
  );

  sectionHeading(doc, "Overdue probes");
  if (data.overdue.length) {
    table(
      doc,
      [
        { title: "Tank", width: 0.28 },
        { title: "Probe", width: 0.22, mono: true },
        { title: "Status", width: 0.16 },
        { title: "Last accepted", width: 0.17 },
        { title: "Was due", width: 0.17 },
      ],
      data.overdue.map((o) => [o.tankName, `${KIND[o.kind]} ${o.serial}`, STATUS[o.status as keyof typeof STATUS] ?? o.status, reportDateTime(o.lastAcceptedAt, tz), reportDateTime(o.dueAt, tz)]),
    );
  } else paragraph(doc, "No probe is overdue.", { color: COLOR.soft });

  sectionHeading(doc, "Probes marked for replacement");
  if (data.forReplacement.length) {
    table(
      doc,
      [
        { title: "Tank", width: 0.4 },
        { title: "Probe", width: 0.6, mono: true },
      ],
      data.forReplacement.map((p) => [p.tankName, `${KIND[p.kind]} ${p.serial}`]),
    );
    paragraph(doc, "A probe is marked for replacement when two calibration runs in a row are rejected.", { size: 8.5, color: COLOR.soft });
  } else paragraph(doc, "No probe is marked for replacement.", { color: COLOR.soft });

  sectionHeading(doc, "Runs per month");
  monthChart(doc, data.perMonth);

  sectionHeading(doc, "Runs in the period");
  if (data.runs.length) {
    table(
      doc,
      [
        { title: "Started", width: 0.17 },
        { title: "Tank", width: 0.16 },
        { title: "Probe", width: 0.15, mono: true },
        { title: "Result", width: 0.28 },
        { title: "Verdict", width: 0.1 },
        { title: "By", width: 0.14 },
      ],
      data.runs.map((r) => [reportDateTime(r.startedAt, tz), r.tankName, `${KIND[r.kind]} ${r.serial}`, r.status === "abandoned" ? "—" : runResultText(r), RUN_STATUS_WORD[r.status], r.userName ?? "—"]),
      { size: 8 },
    );
    const rejected = data.runs.filter((r) => r.status === "rejected");
    if (rejected.length) {
      sectionHeading(doc, "Reasons for rejections");
      for (const r of rejected) paragraph(doc, `${reportDateTime(r.startedAt, tz)} · ${r.tankName} · ${KIND[r.kind]} ${r.serial}: ${r.reasons.join(" ")}`, { size: 8.5 });
    }
  } else paragraph(doc, "No calibration run was finished at this site in the period.", { color: COLOR.soft });

  return { pdf: await finish(), filename: reportFilename(data.site.name, period) };
}

function shareBlock(doc: Doc, data: SiteReportData) {
  const x = doc.page.margins.left;
  const y = doc.y;
  const share = data.sharePct === null ? "—" : `${Math.round(data.sharePct)} %`;
  doc.font("bold").fontSize(26).fillColor(COLOR.accent).text(share, x, y, { lineBreak: false });
  doc.font("regular").fontSize(10).fillColor(COLOR.soft).text(`of pH and EC probes in date (${data.inDate} of ${data.probes} current or due soon)`, x + 90, y + 10, { width: contentWidth(doc) - 90 });
  doc.x = x;
  doc.y = y + 38;
}

/** Accepted, rejected and abandoned runs per month as horizontal bars, with the counts in words. */
function monthChart(doc: Doc, months: SiteReportData["perMonth"]) {
  const x = doc.page.margins.left;
  const w = contentWidth(doc);
  const max = Math.max(1, ...months.map((m) => m.accepted + m.rejected + m.abandoned));
  const barX = x + 60;
  const barW = w - 60 - 170;
  for (const m of months) {
    ensureSpace(doc, 16);
    const y = doc.y;
    doc.font("mono").fontSize(8.5).fillColor(COLOR.soft).text(m.month, x, y + 2, { lineBreak: false });
    doc.rect(barX, y + 3, barW, 8).fill("#f1f0ec");
    let bx = barX;
    for (const [n, color] of [
      [m.accepted, COLOR.accent],
      [m.rejected, COLOR.bad],
      [m.abandoned, COLOR.faint],
    ] as const) {
      const bw = (n / max) * barW;
      if (bw > 0) doc.rect(bx, y + 3, bw, 8).fill(color);
      bx += bw;
    }
    doc.font("regular").fontSize(8.5).fillColor(COLOR.ink).text(`${m.accepted} accepted · ${m.rejected} rejected · ${m.abandoned} abandoned`, barX + barW + 8, y + 2, { width: 162, lineBreak: false });
    doc.x = x;
    doc.y = y + 15;
  }
  doc.y += 4;
}
