import { getDb } from "@/db/client";
import { probeRecord } from "@/db/queries/calibration-history";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";

/** The probe's calibration record: runs, status, drift and next due date, lifecycle. */
export const GET = guarded({ roles: ALL_ROLES, params: idParam }, async ({ user, params }) => probeRecord(getDb(), user.orgId, params.id));
