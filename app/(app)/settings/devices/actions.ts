"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import { registerDevice, revokeDevice, rotateDeviceSecret } from "@/db/queries/settings-devices";
import { OWNER_ONLY, guardedAction } from "@/app/_server/guard";
import { registerDeviceSchema } from "@/lib/settings/schemas";

const done = <T>(value: T) => {
  revalidatePath("/settings", "layout");
  return value;
};
const byId = z.object({ id: z.number().int().positive() });

export const registerDeviceAction = guardedAction({ roles: OWNER_ONLY, action: "register devices", input: registerDeviceSchema }, async (input, user) =>
  done(await registerDevice(getDb(), user, input)),
);

export const rotateDeviceAction = guardedAction({ roles: OWNER_ONLY, action: "rotate device credentials", input: byId }, async ({ id }, user) =>
  done(await rotateDeviceSecret(getDb(), user, id)),
);

export const revokeDeviceAction = guardedAction({ roles: OWNER_ONLY, action: "revoke device credentials", input: byId }, async ({ id }, user) => done(await revokeDevice(getDb(), user, id)));
