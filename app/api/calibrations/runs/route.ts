import { z } from "zod";
import { getDb } from "@/db/client";
import { runsInProgress, startRun } from "@/db/queries/calibration-runs";
import { ALL_ROLES, CAN_CHANGE, guarded } from "@/app/_server/guard";
import { sendDosing } from "@/app/api/holds/dosing";

const startBody = z.object({
  tankId: z.number().int().positive(),
  probeId: z.number().int().positive(),
  standards: z.array(z.string().trim().min(1).max(2000)).min(1).max(3).optional(),
  holdMinutes: z.number().int().min(5).max(24 * 60).optional(),
});

/** Runs in progress, to resume. */
export const GET = guarded({ roles: ALL_ROLES }, async ({ user }) => ({
  runs: (await runsInProgress(getDb(), user.orgId)).map((r) => ({ id: r.id, probeId: r.probeId, tankId: r.tankId, tankName: r.tank.name, serial: r.probe.serial, kind: r.probe.kind, startedAt: r.startedAt })),
}));

/** Starts a guided run (or resumes the one in progress), putting the tank on hold. */
export const POST = guarded({ roles: CAN_CHANGE, action: "run calibrations", body: startBody, status: 201 }, async ({ user, body }) => {
  const now = Date.now();
  const started = await startRun(getDb(), user, body, now);
  const dosing = started.placed ? await sendDosing("inhibit", started.placed.hold, started.placed.tank, now) : null;
  return { runId: started.runId, resumed: started.resumed, holdPlaced: started.placed !== null, dosing };
});
