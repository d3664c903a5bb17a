// The morning digest: once per site per local day, from the start of the day shift, the
// day-shift role gets the list of pH and EC probes whose calibration is due soon, lapsed or
// was never done.
import type { Db } from "../../db/client";
import { notifications } from "../../db/schema";
import { appUrl } from "../mailer";
import { calibrationInfo, type AlertContext, type SiteContext } from "./context";
import { recipientsWithRole, ROLE_WORDS, type SendMail } from "./notify";
import { isDayShift, localParts } from "./shifts";
import { digestKey, readStates, writeStates } from "./state-store";

const WORD = { "due-soon": "due soon", lapsed: "lapsed", never: "never calibrated" } as const;
const DAY_MS = 86_400_000;

export async function sendDueDigests(db: Db, sendMail: SendMail, ctx: AlertContext, now: number): Promise<number> {
  const sites = new Map<number, SiteContext>();
  for (const t of ctx.tanks.values()) sites.set(t.site.id, t.site);
  const done = await readStates(db, [...sites.keys()].map(digestKey));
  let mails = 0;
  for (const site of sites.values()) {
    const { date } = localParts(now, site.timeZone);
    const last = done.get(digestKey(site.id)) as { date?: string } | undefined;
    if (!isDayShift(site, now) || last?.date === date) continue;

    const lines: string[] = [];
    for (const tank of [...ctx.tanks.values()].filter((t) => t.site.id === site.id).sort((a, b) => a.name.localeCompare(b.name))) {
      for (const probe of tank.probes.filter((p) => p.kind !== "temp")) {
        const info = calibrationInfo(tank, probe, now);
        if (info.status === "current") continue;
        const due = info.dueAt ? ` (due ${new Date(info.dueAt).toISOString().slice(0, 10)}${info.status === "lapsed" ? `, ${Math.floor((now - info.dueAt) / DAY_MS)} d ago` : ""})` : "";
        lines.push(`- ${tank.name}: ${probe.kind === "ph" ? "pH" : "EC"} probe ${probe.serial}, ${WORD[info.status]}${due}`);
      }
    }
    if (lines.length > 0) {
      const recipients = await recipientsWithRole(db, site.orgId, site.dayRole);
      const subject = `[Tidewell] ${site.name}: ${lines.length} calibration${lines.length > 1 ? "s" : ""} due`;
      const text = [
        `Good morning. Calibrations due at ${site.name} on ${date}:`,
        "",
        ...lines,
        "",
        "Put the tank on hold before taking a probe out. Buffers and pH solutions call for gloves and eye protection;",
        "glass probes are fragile; follow the probe maker's instructions.",
        "",
        `Calibrations: ${appUrl()}/calibrations`,
        "",
        `You get this mail as the ${ROLE_WORDS[site.dayRole]} on the day shift.`,
      ].join("\n");
      const rows: (typeof notifications.$inferInsert)[] = [];
      for (const r of recipients) {
        let error: string | null = null;
        try {
          await sendMail({ to: r.email, subject, text });
          mails++;
        } catch (err) {
          error = err instanceof Error ? err.message : String(err);
        }
        rows.push({ orgId: site.orgId, incidentId: null, userId: r.id, kind: "digest", toAddress: r.email, subject, status: error ? "failed" : "sent", error, sentAt: now });
      }
      await db.transaction(async (tx) => {
        if (rows.length) await tx.insert(notifications).values(rows);
        await writeStates(tx, [[digestKey(site.id), { date }]], now);
      });
    } else {
      await db.transaction((tx) => writeStates(tx, [[digestKey(site.id), { date }]], now));
    }
  }
  return mails;
}
