"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import { createTank, updateTank } from "@/db/queries/settings-tanks";
import { CAN_CHANGE, guardedAction } from "@/app/_server/guard";
import { tankSchema } from "@/lib/settings/schemas";

const done = <T>(value: T) => {
  revalidatePath("/", "layout");
  return value;
};

export const createTankAction = guardedAction({ roles: CAN_CHANGE, action: "add tanks", input: tankSchema }, async (input, user) => done(await createTank(getDb(), user, input)));

export const updateTankAction = guardedAction(
  { roles: CAN_CHANGE, action: "change tanks and targets", input: z.object({ id: z.number().int().positive(), values: tankSchema }) },
  async ({ id, values }, user) => done(await updateTank(getDb(), user, id, values)),
);
