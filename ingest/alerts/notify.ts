// E-mail for incidents: to the role on shift at the site (or the lapsed-calibration route),
// escalation to the owner. Every send is recorded in `notifications` and as a "notified"
// incident event naming whom.
import { and, eq } from "drizzle-orm";
import type { Db } from "../../db/client";
import { incidentEvents, notifications, users, type Role } from "../../db/schema";
import { describeCause, type AlertEvent, type Cause } from "../../lib/alerts";
import { appUrl, type OutgoingMail } from "../mailer";
import { ackUrl, signAckToken } from "./ack-link";
import type { SiteContext, TankContext } from "./context";
import { onShift } from "./shifts";

export type SendMail = (mail: OutgoingMail) => Promise<string>;

export const ROLE_WORDS: Record<Role, string> = { owner: "owner", grower: "grower", night_manager: "night manager" };

export interface Recipient {
  id: number;
  name: string;
  email: string;
  role: Role;
}

export async function recipientsWithRole(db: Db, orgId: number, role: Role): Promise<Recipient[]> {
  return db
    .select({ id: users.id, name: users.name, email: users.email, role: users.role })
    .from(users)
    .where(and(eq(users.orgId, orgId), eq(users.role, role), eq(users.active, true), eq(users.notifyEmail, true)));
}

export function siteTime(site: SiteContext, at: number): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone: site.timeZone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(at);
}

export interface Route {
  role: Role;
  /** Why a recipient gets the mail, after "the <role> ": "on the night shift". */
  why: string;
  /** The duty nobody may have been there for: "on the night shift at North Greenhouse". */
  duty: string;
}

/** Whom an incident's first mail goes to, and why (shown in the timeline and the mail). */
export function routeFor(tank: TankContext, ev: Pick<AlertEvent, "cause" | "calibrationLapsed">, now: number): Route {
  const lapsedRole = ev.calibrationLapsed ? tank.lapsedRoute[ev.cause] : undefined;
  if (lapsedRole) return { role: lapsedRole, why: "who gets alerts on readings from a lapsed calibration", duty: "for alerts on readings from a lapsed calibration" };
  const s = onShift(tank.site, now);
  return { role: s.role, why: `on the ${s.shift} shift`, duty: `on the ${s.shift} shift at ${tank.site.name}` };
}

/** The timeline's entry when a role had nobody to mail: names the role and its duty (shift). */
export function nobodyToMailDetail(role: Role, duty: string): string {
  return `Nobody to e-mail: no active ${ROLE_WORDS[role]} ${duty} has e-mail notifications on`;
}

interface IncidentMail {
  incidentId: number;
  tank: TankContext;
  cause: Cause;
  message: string;
  severity: string;
  openedAt: number;
  calibrationLapsed: boolean;
}

function incidentText(m: IncidentMail, ack: string, intro: string, why: string): string {
  const place = m.tank.site.name;
  return [
    intro,
    "",
    `${m.tank.name} (${place})`,
    `${describeCause(m.cause)}: ${m.message}`,
    `Severity: ${m.severity}${m.calibrationLapsed ? " · the probe's calibration has lapsed, so the reading may be off" : ""}`,
    `Opened: ${siteTime(m.tank.site, m.openedAt)} (${m.tank.site.timeZone})`,
    "",
    `Acknowledge (asks you to confirm; works once, for 24 hours):`,
    ack,
    "",
    `Open the incident:`,
    `${appUrl()}/incidents/${m.incidentId}`,
    "",
    `You get this mail because you are ${why}. Change e-mail notifications in Tidewell's settings.`,
    "Alerts are an aid, not a substitute for walking the tanks.",
  ].join("\n");
}

export interface SendOutcome {
  sent: number;
  failed: number;
}

/**
 * Mails each recipient a signed acknowledge link and records the send; returns counts.
 * `kind` "escalation" mails the owners about an incident nobody acknowledged.
 */
export async function mailIncident(
  db: Db,
  sendMail: SendMail,
  m: IncidentMail,
  o: { kind: "incident" | "escalation"; recipients: Recipient[]; route: Route; now: number },
): Promise<SendOutcome> {
  const outcome: SendOutcome = { sent: 0, failed: 0 };
  const rows: (typeof notifications.$inferInsert)[] = [];
  const events: (typeof incidentEvents.$inferInsert)[] = [];
  const prefix = o.kind === "escalation" ? "[Tidewell] Unacknowledged: " : "[Tidewell] ";
  const subject = `${prefix}${m.tank.name}: ${describeCause(m.cause)}`;
  const intro =
    o.kind === "escalation"
      ? `Nobody has acknowledged this incident for ${m.tank.site.escalateAfterMinutes} minutes.`
      : "A Tidewell alert needs someone to look at the tank.";
  for (const r of o.recipients) {
    const token = await signAckToken({ userId: r.id, incidentId: m.incidentId, now: o.now });
    const text = incidentText(m, ackUrl(token), intro, `the ${ROLE_WORDS[r.role]} ${o.route.why}`);
    let error: string | null = null;
    try {
      await sendMail({ to: r.email, subject, text });
      outcome.sent++;
    } catch (err) {
      error = err instanceof Error ? err.message : String(err);
      outcome.failed++;
    }
    rows.push({ orgId: m.tank.orgId, incidentId: m.incidentId, userId: r.id, kind: o.kind, toAddress: r.email, subject, status: error ? "failed" : "sent", error, sentAt: o.now });
    const who = `${r.name} (${ROLE_WORDS[r.role]}, ${o.route.why})`;
    events.push({ incidentId: m.incidentId, at: o.now, kind: "notified", userId: null, detail: error ? `E-mail to ${who} failed: ${error}` : `E-mail to ${who}` });
  }
  if (o.recipients.length === 0) {
    events.push({ incidentId: m.incidentId, at: o.now, kind: "notified", detail: nobodyToMailDetail(o.route.role, o.route.duty) });
  }
  await db.transaction(async (tx) => {
    if (rows.length) await tx.insert(notifications).values(rows);
    await tx.insert(incidentEvents).values(events);
  });
  return outcome;
}
