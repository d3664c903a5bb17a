import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { notFound } from "@/app/_server/errors";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";

export const GET = guarded({ roles: ALL_ROLES, params: idParam }, async ({ user, params }) => {
  const [tank] = await tankOverview(getDb(), user.orgId, { tankId: params.id });
  if (!tank) throw notFound("That tank");
  return { tank };
});
