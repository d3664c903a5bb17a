import { z } from "zod";
import { getDb } from "@/db/client";
import { liveSnapshot } from "@/db/queries/calibration-live";
import { probeInOrg } from "@/db/queries/calibration-scope";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";

/** Latest raw and corrected readings (newer than `since`), the tank's temperature and the stability. */
export const GET = guarded(
  { roles: ALL_ROLES, params: idParam, query: z.object({ since: z.coerce.number().int().nonnegative().optional() }) },
  async ({ user, params, query }) => {
    const db = getDb();
    const { probe } = await probeInOrg(db, user.orgId, params.id);
    return { ...(await liveSnapshot(db, probe, { since: query.since, now: Date.now() })), now: Date.now() };
  },
);
