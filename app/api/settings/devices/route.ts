import { getDb } from "@/db/client";
import { listDevices, registerDevice } from "@/db/queries/settings-devices";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { registerDeviceSchema } from "@/lib/settings/schemas";

export const GET = guarded({ roles: OWNER_ONLY, action: "see device credentials" }, async ({ user }) => ({ devices: await listDevices(getDb(), user.orgId) }));

/** Registers a tank controller; the secret in the answer is shown this once and never again. */
export const POST = guarded({ roles: OWNER_ONLY, action: "register devices", body: registerDeviceSchema, status: 201 }, async ({ user, body }) => ({
  credentials: await registerDevice(getDb(), user, body),
}));
