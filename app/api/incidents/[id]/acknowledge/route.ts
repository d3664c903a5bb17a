import { z } from "zod";
import { getDb } from "@/db/client";
import { acknowledgeIncident } from "@/db/queries/incident-actions";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";
import { announceIncident } from "../../announce";

export const POST = guarded(
  { roles: ALL_ROLES, params: idParam, body: z.object({ note: z.string().trim().max(2000).optional() }) },
  async ({ user, params, body }) => {
    const now = Date.now();
    const incident = await acknowledgeIncident(getDb(), user, params.id, body.note || undefined, now);
    announceIncident(incident, now);
    return { incident };
  },
);
