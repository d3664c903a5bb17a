// After a calibration is saved: tell the ingest (and live pages) on the organisation's event
// topic, so readings from the effective time on are corrected with it. Best effort: the ingest
// also re-reads the calibrations on its own poll.
import { EVENT_PUBLISH, orgEventMessage } from "@/ingest/alerts/org-events";
import { publish } from "@/app/_server/mqtt";

export async function announceCalibration(o: { orgId: number; tankId: number; runId: number; at: number; summary: string }): Promise<boolean> {
  const msg = orgEventMessage({ type: "calibration.saved", orgId: o.orgId, tankId: o.tankId, id: o.runId, at: o.at, summary: o.summary });
  try {
    await publish(msg.topic, msg.payload, EVENT_PUBLISH);
    return true;
  } catch {
    return false;
  }
}
