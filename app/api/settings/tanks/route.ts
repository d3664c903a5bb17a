import { getDb } from "@/db/client";
import { createTank, listTankSettings } from "@/db/queries/settings-tanks";
import { CAN_CHANGE, guarded } from "@/app/_server/guard";
import { tankSchema } from "@/lib/settings/schemas";

export const GET = guarded({ roles: CAN_CHANGE, action: "see tank settings" }, async ({ user }) => ({
  tanks: (await listTankSettings(getDb(), user.orgId)).map((r) => ({ ...r.tank, siteName: r.siteName, zoneName: r.zoneName, siteMaxCalibrationIntervalDays: r.siteMaxInterval })),
}));

export const POST = guarded({ roles: CAN_CHANGE, action: "add tanks", body: tankSchema, status: 201 }, async ({ user, body }) => ({ tank: await createTank(getDb(), user, body) }));
