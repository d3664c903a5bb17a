// GET /api/ingest/health: the ingest workers' health snapshots (written every second to
// worker_status) and the refused payloads kept in dead_letters, counted per reason.
import { count, desc, max } from "drizzle-orm";
import { ALL_ROLES, guarded } from "@/app/_server/guard";
import { getDb } from "@/db/client";
import { deadLetters, workerStatus } from "@/db/schema";
import { ingestStats } from "@/ingest/payloads";

/** A snapshot older than this means the worker is down or stuck. */
const STALE_AFTER_MS = 5000;

export const dynamic = "force-dynamic";

export const GET = guarded({ roles: ALL_ROLES }, async () => {
  const db = getDb();
  const now = Date.now();
  const [workers, letters] = await Promise.all([
    db.select().from(workerStatus).orderBy(workerStatus.name),
    db
      .select({ reason: deadLetters.reason, samples: count(), lastAt: max(deadLetters.at) })
      .from(deadLetters)
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
        // A snapshot from another version of the worker is passed on as it is.
        stats: stats.success ? stats.data : w.stats,
      };
    }),
    // The table keeps a bounded sample per reason; the full counts are in each worker's stats.refusals.
    deadLetters: letters.map((l) => ({ reason: l.reason, samples: l.samples, lastAt: l.lastAt })),
  };
});
