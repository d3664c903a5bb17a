// After a hold is committed: send the controller its dosing command and tell the live web.
// A broker that cannot be reached does not undo the hold; the caller reports it, and the
// ingest's alert runner resends whatever is still marked unsent.
import { getDb } from "@/db/client";
import { markDosingSent, type Hold, type HoldTank } from "@/db/queries/holds";
import { DOSING_PUBLISH, inhibitMessage, resumeMessage } from "@/ingest/alerts/dosing-command";
import { EVENT_PUBLISH, orgEventMessage } from "@/ingest/alerts/org-events";
import { publish } from "@/app/_server/mqtt";

export interface DosingOutcome {
  /** "sent", "no-controller" (nothing to tell), or "failed" with the reason. */
  status: "sent" | "no-controller" | "failed";
  message: string;
}

export async function sendDosing(command: "inhibit" | "resume", hold: Hold, tank: HoldTank, now: number): Promise<DosingOutcome> {
  const outcome = await sendCommand(command, hold, tank, now);
  if (outcome.status !== "failed") {
    const event = orgEventMessage({
      type: command === "inhibit" ? "hold.placed" : "hold.released",
      orgId: tank.orgId,
      tankId: tank.id,
      id: hold.id,
      at: now,
      summary: `${tank.name}: ${command === "inhibit" ? `on hold — ${hold.reason}` : "hold released"}`,
    });
    // Best effort: live pages also re-read the database on their own.
    await publish(event.topic, event.payload, EVENT_PUBLISH).catch(() => undefined);
  }
  return outcome;
}

async function sendCommand(command: "inhibit" | "resume", hold: Hold, tank: HoldTank, now: number): Promise<DosingOutcome> {
  if (!tank.controllerId) return { status: "no-controller", message: "This tank has no controller, so no dosing command was needed." };
  const msg = command === "inhibit" ? inhibitMessage(tank.controllerId, hold, now) : resumeMessage(tank.controllerId, hold, now);
  try {
    await publish(msg.topic, msg.payload, DOSING_PUBLISH);
    await markDosingSent(getDb(), hold.id, command, now);
    return { status: "sent", message: command === "inhibit" ? `Dosing inhibited on ${tank.controllerId}.` : `Dosing resumed on ${tank.controllerId}.` };
  } catch (err) {
    const why = err instanceof Error ? err.message : String(err);
    return {
      status: "failed",
      message:
        command === "inhibit"
          ? `The hold is recorded, but the dosing-inhibit command did not reach ${tank.controllerId} (${why}). Tidewell keeps retrying; until then stop dosing at the controller by hand.`
          : `The hold is released, but the dosing-resume command did not reach ${tank.controllerId} (${why}). Tidewell keeps retrying; check that the controller resumes dosing.`,
    };
  }
}
