"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import { createSite, createZone, deleteZone, renameZone, updateSite } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guardedAction } from "@/app/_server/guard";
import { renameZoneSchema, siteSchema, zoneSchema } from "@/lib/settings/schemas";

const done = <T>(value: T) => {
  revalidatePath("/settings", "layout");
  return value;
};
const withId = <S extends z.ZodType>(values: S) => z.object({ id: z.number().int().positive(), values });

export const createSiteAction = guardedAction({ roles: OWNER_ONLY, action: "add sites", input: siteSchema }, async (input, user) => done(await createSite(getDb(), user, input)));

export const updateSiteAction = guardedAction({ roles: OWNER_ONLY, action: "change sites", input: withId(siteSchema) }, async ({ id, values }, user) =>
  done(await updateSite(getDb(), user, id, values)),
);

export const createZoneAction = guardedAction({ roles: OWNER_ONLY, action: "add zones", input: zoneSchema }, async ({ siteId, name }, user) => done(await createZone(getDb(), user, siteId, name)));

export const renameZoneAction = guardedAction({ roles: OWNER_ONLY, action: "change zones", input: withId(renameZoneSchema) }, async ({ id, values }, user) =>
  done(await renameZone(getDb(), user, id, values.name)),
);

export const deleteZoneAction = guardedAction({ roles: OWNER_ONLY, action: "delete zones", input: z.object({ id: z.number().int().positive() }) }, async ({ id }, user) =>
  done(await deleteZone(getDb(), user, id)),
);
