import { z } from "zod";
import { getDb } from "@/db/client";
import { probeInOrg } from "@/db/queries/calibration-scope";
import { addSpotCheck, listSpotChecks } from "@/db/queries/spot-checks";
import { ALL_ROLES, CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";

export const GET = guarded({ roles: ALL_ROLES, params: idParam }, async ({ user, params }) => listSpotChecks(getDb(), user.orgId, params.id));

const spotBody = z.object({
  takenAt: z.number().int().positive(),
  /** pH, or EC in µS/cm at 25 °C. */
  meterValue: z.number().finite(),
  note: z.string().trim().max(500).optional(),
});

/** Records a handheld meter's reading and compares it with Tidewell's at that time. */
export const POST = guarded({ roles: CAN_CHANGE, action: "enter spot checks", params: idParam, status: 201 }, async ({ user, params, req }) => {
  const db = getDb();
  await probeInOrg(db, user.orgId, params.id);
  const body = await parseBody(req, spotBody);
  return addSpotCheck(db, user, { ...body, probeId: params.id });
});
