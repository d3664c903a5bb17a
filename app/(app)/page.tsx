import { requestNow } from "@/app/_server/clock";
import type { Metadata } from "next";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { tankOverview } from "@/db/queries/overview";
import { currentUser } from "@/app/_server/session";
import { ALL_ROLES, guardedAction } from "@/app/_server/guard";
import { loadTankSeries } from "@/app/api/tanks/[id]/series/load-series";
import { TankWall } from "@/components/tanks/tank-wall";
import { SPARK_POINTS, SPARK_WINDOW_MS, type CachedSeries } from "@/components/live/queries";

export const metadata: Metadata = { title: "Tank wall" };
export const dynamic = "force-dynamic";

const wallSearch = z.object({
  display: z.enum(["wall"]).optional().catch(undefined),
  site: z.coerce.number().int().positive().optional().catch(undefined),
});

/** The wall's new-incident chime, remembered per user. */
async function saveWallSound(on: boolean) {
  "use server";
  return guardedAction({ roles: ALL_ROLES, input: z.boolean() }, async (value, user) => {
    await getDb().update(users).set({ wallSound: value }).where(eq(users.id, user.id));
    return { wallSound: value };
  })(on);
}

export default async function TankWallPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = (await currentUser())!;
  const search = wallSearch.parse(await searchParams);
  const now = requestNow();
  const db = getDb();
  const tanks = await tankOverview(db, user.orgId, { now, siteId: search.site });
  const sparks = await Promise.all(tanks.map((t) => loadTankSeries(db, user.orgId, t.id, now - SPARK_WINDOW_MS, now, SPARK_POINTS)));
  const initialSparks: Record<number, CachedSeries> = {};
  for (const s of sparks) if (s) initialSparks[s.tankId] = { ...s, rolling: SPARK_WINDOW_MS };
  return (
    <TankWall
      initialTanks={tanks}
      initialSparks={initialSparks}
      renderedAt={now}
      ecUnit={user.ecUnit}
      wallSound={user.wallSound}
      display={search.display ?? null}
      site={search.site}
      saveWallSound={saveWallSound}
    />
  );
}
