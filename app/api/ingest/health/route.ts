// GET /api/ingest/health: whether the ingest workers are alive (their snapshots in worker_status)
// and the refused payloads of this organisation's controllers kept in dead_letters, per reason.
// The workers' throughput and refusal counts span every organisation on the installation, so
// they are not shown here (the operator reads them from worker_status or `npm run bench`).
import { count, desc, eq, inArray, max } from "drizzle-orm";
import { ALL_ROLES, guarded } from "@/app/_server/guard";
import { getDb } from "@/db/client";
import { deadLetters, devices, workerStatus } from "@/db/schema";
import { ingestStats } from "@/ingest/payloads";
import { topics } from "@/ingest/topics";

/** A snapshot older than this means the worker is down or stuck. */
const STALE_AFTER_MS = 5000;

export const dynamic = "force-dynamic";

export const GET = guarded({ roles: ALL_ROLES }, async ({ user }) => {
  const db = getDb();
  const now = Date.now();
  const controllers = await db.selectDistinct({ id: devices.controllerId }).from(devices).where(eq(devices.orgId, user.orgId));
  const ownTopics = controllers.map((c) => topics.raw(c.id));
  const [workers, letters] = await Promise.all([
    db.select().from(workerStatus).orderBy(workerStatus.name),
    ownTopics.length === 0
      ? Promise.resolve([])
      : db
          .select({ reason: deadLetters.reason, samples: count(), lastAt: max(deadLetters.at) })
          .from(deadLetters)
          .where(inArray(deadLetters.topic, ownTopics))
          .groupBy(deadLetters.reason)
          .orderBy(desc(count())),
  ]);
  return {
    now,
    workers: workers.map((w) => {
      const stats = ingestStats.safeParse(w.stats);
      return {
        name: w.name,
        updatedAt: w.updatedAt,
        ageMs: now - w.updatedAt,
        stale: now - w.updatedAt > STALE_AFTER_MS,
        mqttConnected: stats.success ? stats.data.mqttConnected : null,
      };
    }),
    // A bounded sample per reason, from this organisation's controllers only.
    deadLetters: letters.map((l) => ({ reason: l.reason, samples: l.samples, lastAt: l.lastAt })),
  };
});
