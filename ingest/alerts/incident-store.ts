// Alerts become incidents, grouped per tank and cause: one open/acknowledged incident per
// tank+cause; a fire on it adds nothing, a clear sets cleared_at (auto-resolved later by the
// tick), a fire before that reopens it.
import { and, eq, ne } from "drizzle-orm";
import { incidentEvents, incidents } from "../../db/schema";
import type { AlertEvent, Cause } from "../../lib/alerts";
import type { TankContext } from "./context";
import type { Tx } from "./state-store";

export interface IncidentChange {
  type: "incident.opened" | "incident.updated" | "incident.resolved";
  orgId: number;
  tankId: number;
  incidentId: number;
  at: number;
  summary: string;
}

export interface Applied {
  opened: { incidentId: number; tank: TankContext; event: AlertEvent }[];
  changes: IncidentChange[];
}

export async function applyAlertEvents(
  tx: Tx,
  tank: TankContext,
  events: AlertEvent[],
  stillFiring: (cause: Cause) => boolean,
  out: Applied,
): Promise<void> {
  for (const ev of events) {
    const [current] = await tx
      .select()
      .from(incidents)
      .where(and(eq(incidents.tankId, tank.id), eq(incidents.cause, ev.cause), ne(incidents.state, "resolved")))
      .limit(1);
    const change = (type: IncidentChange["type"], incidentId: number, summary: string) =>
      out.changes.push({ type, orgId: tank.orgId, tankId: tank.id, incidentId, at: ev.at, summary: `${tank.name}: ${summary}` });

    if (ev.type === "fire") {
      if (!current) {
        const probeId = ev.probeId !== undefined ? Number(ev.probeId) : null;
        const [row] = await tx
          .insert(incidents)
          .values({
            orgId: tank.orgId,
            siteId: tank.site.id,
            tankId: tank.id,
            probeId,
            cause: ev.cause,
            measure: ev.measure,
            severity: ev.severity,
            state: "open",
            message: ev.message,
            calibrationLapsed: ev.calibrationLapsed,
            openedAt: ev.at,
          })
          .returning({ id: incidents.id });
        await tx.insert(incidentEvents).values({ incidentId: row.id, at: ev.at, kind: "opened", detail: ev.message });
        out.opened.push({ incidentId: row.id, tank, event: ev });
        change("incident.opened", row.id, ev.message);
      } else if (current.clearedAt !== null) {
        await tx.update(incidents).set({ clearedAt: null }).where(eq(incidents.id, current.id));
        await tx.insert(incidentEvents).values({ incidentId: current.id, at: ev.at, kind: "reopened", detail: ev.message });
        change("incident.updated", current.id, `reopened: ${ev.message}`);
      }
      continue;
    }

    // A clear from one probe leaves the incident standing while another probe still fires the cause.
    if (!current || current.clearedAt !== null || stillFiring(ev.cause)) continue;
    await tx.update(incidents).set({ clearedAt: ev.at }).where(eq(incidents.id, current.id));
    await tx.insert(incidentEvents).values({ incidentId: current.id, at: ev.at, kind: "cleared", detail: ev.message });
    change("incident.updated", current.id, `cleared: ${ev.message}`);
  }
}
