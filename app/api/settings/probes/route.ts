import { getDb } from "@/db/client";
import { addProbe, listProbeSettings } from "@/db/queries/settings-probes";
import { CAN_CHANGE, guarded } from "@/app/_server/guard";
import { probeSchema } from "@/lib/settings/schemas";

export const GET = guarded({ roles: CAN_CHANGE, action: "see probe settings" }, async ({ user }) => ({
  probes: (await listProbeSettings(getDb(), user.orgId)).map((r) => ({ ...r.probe, tankName: r.tankName, siteName: r.siteName })),
}));

export const POST = guarded({ roles: CAN_CHANGE, action: "add probes", body: probeSchema, status: 201 }, async ({ user, body }) => ({ probe: await addProbe(getDb(), user, body) }));
