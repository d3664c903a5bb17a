// Tells live pages an incident changed. Not awaited: an unreachable broker must not slow the
// person acknowledging; pages also re-read the database.
import { EVENT_PUBLISH, orgEventMessage } from "@/ingest/alerts/org-events";
import { publish } from "@/app/_server/mqtt";

export function announceIncident(i: { id: number; orgId: number; tankId: number; state: string; message: string }, at: number) {
  const msg = orgEventMessage({ type: i.state === "resolved" ? "incident.resolved" : "incident.updated", orgId: i.orgId, tankId: i.tankId, id: i.id, at, summary: `${i.state}: ${i.message}` });
  void publish(msg.topic, msg.payload, EVENT_PUBLISH).catch(() => undefined);
}
