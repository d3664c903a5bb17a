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
  /** Made up by the device; a point sent twice (after a dropped connection) is saved once. */
  clientKey: z.uuid("The point's key must be a UUID").optional(),
  /** How long the point waited on the device before being sent (at most a day). */
  queuedMs: z.number().int().min(0).max(24 * 3_600_000, "A point kept offline for more than a day is too old; capture it again").optional(),
});

/** Captures the current step's point from the probe's live reading. */
export const POST = guarded({ roles: CAN_CHANGE, action: "change calibrations", params: idParam, status: 201 }, async ({ user, params, req }) => {
  const db = getDb();
  await runInOrg(db, user.orgId, params.id);
  const body = await parseBody(req, pointBody);
  return { point: await capturePoint(db, user, params.id, body) };
});
