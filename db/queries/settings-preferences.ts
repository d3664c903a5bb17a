// A user's own display and notification preferences.
import { eq } from "drizzle-orm";
import type { z } from "zod";
import type { Db } from "../client";
import { users } from "../schema";
import type { preferencesSchema } from "../../lib/settings/schemas";
import { audit, changedFields, type Tx } from "./audit";
import type { Actor } from "./settings-users";

export async function getPreferences(db: Db | Tx, userId: number) {
  const row = await db.query.users.findFirst({ where: eq(users.id, userId), columns: { ecUnit: true, notifyEmail: true, wallSound: true } });
  return row ?? { ecUnit: "mS/cm" as const, notifyEmail: true, wallSound: false };
}

export async function updatePreferences(db: Db, actor: Actor, input: z.output<typeof preferencesSchema>, now = Date.now()) {
  return db.transaction(async (tx) => {
    const before = await getPreferences(tx, actor.id);
    const [after] = await tx
      .update(users)
      .set(input)
      .where(eq(users.id, actor.id))
      .returning({ ecUnit: users.ecUnit, notifyEmail: users.notifyEmail, wallSound: users.wallSound });
    const changed = changedFields(before, input);
    if (Object.keys(changed).length) await audit(tx, { orgId: actor.orgId, userId: actor.id, at: now, action: "preferences.update", entity: "user", entityId: actor.id, detail: { changed } });
    return after;
  });
}
