"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import { addProbe, moveProbe, replaceProbe, retireProbe } from "@/db/queries/settings-probes";
import { CAN_CHANGE, guardedAction } from "@/app/_server/guard";
import { moveProbeSchema, probeSchema, replaceProbeSchema, retireProbeSchema } from "@/lib/settings/schemas";

const done = <T>(value: T) => {
  revalidatePath("/", "layout");
  return value;
};
const withId = <S extends z.ZodType>(values: S) => z.object({ id: z.number().int().positive(), values });

export const addProbeAction = guardedAction({ roles: CAN_CHANGE, action: "add probes", input: probeSchema }, async (input, user) => done(await addProbe(getDb(), user, input)));

export const moveProbeAction = guardedAction({ roles: CAN_CHANGE, action: "move probes", input: withId(moveProbeSchema) }, async ({ id, values }, user) =>
  done(await moveProbe(getDb(), user, id, values.tankId)),
);

export const retireProbeAction = guardedAction({ roles: CAN_CHANGE, action: "retire probes", input: withId(retireProbeSchema) }, async ({ id }, user) =>
  done(await retireProbe(getDb(), user, id)),
);

export const replaceProbeAction = guardedAction({ roles: CAN_CHANGE, action: "replace probes", input: withId(replaceProbeSchema) }, async ({ id, values }, user) =>
  done(await replaceProbe(getDb(), user, id, values)),
);
