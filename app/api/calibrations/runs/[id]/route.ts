import { getDb } from "@/db/client";
import { getRunView } from "@/db/queries/calibration-runs";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";

/** The run with its points, the step it is at, and the fit once every point is in. */
export const GET = guarded({ roles: ALL_ROLES, params: idParam }, async ({ user, params }) => getRunView(getDb(), user.orgId, params.id));
