import { z } from "zod";
import { getDb } from "@/db/client";
import { resolveIncident } from "@/db/queries/incident-actions";
import { CAN_CHANGE, guarded, idParam } from "@/app/_server/guard";
import { announceIncident } from "../../announce";

export const POST = guarded(
  { roles: CAN_CHANGE, action: "resolve incidents", params: idParam, body: z.object({ note: z.string().trim().max(2000).optional() }) },
  async ({ user, params, body }) => {
    const now = Date.now();
    const incident = await resolveIncident(getDb(), user, params.id, body.note || undefined, now);
    announceIncident(incident, now);
    return { incident };
  },
);
