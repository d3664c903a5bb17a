import { z } from "zod";
import { getDb } from "@/db/client";
import { capturePoint } from "@/db/queries/calibration-runs";
import { runInOrg } from "@/db/queries/calibration-scope";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";

const pointBody = z.object({
  purpose: z.enum(["as_found", "point"]),
  lot: z.string().trim().min(1).max(60).optional(),
  expiresOn: z.iso.date("Enter the expiry date as YYYY-MM-DD").optional(),
  tempC: z.number().min(0).max(60).optional(),
  note: z.string().trim().max(1000).optional(),
  /** The time of the reading shown when the grower clicked (ms epoch). */
  readingTs: z.number().int().positive().optional(),
});

/** Captures the current step's point from the probe's live reading. */
export const POST = guarded({ roles: CAN_CHANGE, action: "change calibrations", params: idParam, status: 201 }, async ({ user, params, req }) => {
  const db = getDb();
  await runInOrg(db, user.orgId, params.id);
  const body = await parseBody(req, pointBody);
  return { point: await capturePoint(db, user, params.id, body) };
});
