import { getDb } from "@/db/client";
import { calibrationCompliance } from "@/db/queries/calibration-compliance";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";

/** Calibration compliance per site (owner). */
export const GET = guarded({ roles: OWNER_ONLY, action: "review calibration compliance" }, async ({ user }) => ({ sites: await calibrationCompliance(getDb(), user.orgId) }));
