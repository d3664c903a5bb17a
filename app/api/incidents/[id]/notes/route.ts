import { z } from "zod";
import { getDb } from "@/db/client";
import { addIncidentNote } from "@/db/queries/incident-actions";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";

export const POST = guarded(
  { roles: ALL_ROLES, params: idParam, body: z.object({ note: z.string().trim().max(2000).default("") }), status: 201 },
  async ({ user, params, body }) => ({ event: await addIncidentNote(getDb(), user, params.id, body.note) }),
);
