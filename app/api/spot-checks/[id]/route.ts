// One spot check: corrected (time, meter value, note) or deleted when entered in error, by a
// grower or owner. Both leave an audit entry with the values before.
import { z } from "zod";
import { getDb } from "@/db/client";
import { deleteSpotCheck, editSpotCheck, spotCheckInOrg } from "@/db/queries/spot-checks";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";

const editBody = z.object({
  takenAt: z.number().int().positive(),
  /** pH, or EC in µS/cm at 25 °C. */
  meterValue: z.number().finite(),
  note: z.string().trim().max(500).optional(),
});

export const PUT = guarded({ roles: CAN_CHANGE, action: "change spot checks", params: idParam }, async ({ user, params, req }) => {
  const db = getDb();
  await spotCheckInOrg(db, user.orgId, params.id);
  const body = await parseBody(req, editBody);
  return editSpotCheck(db, user, params.id, body);
});

export const DELETE = guarded({ roles: CAN_CHANGE, action: "delete spot checks", params: idParam }, async ({ user, params }) => deleteSpotCheck(getDb(), user, params.id));
