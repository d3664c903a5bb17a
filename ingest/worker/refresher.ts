// Keeps the in-memory views (probes, calibrations, holds) current: on an org event and by a
// periodic poll. When a calibration or a hold changed, readings this worker committed with the
// old view are corrected again (recomputeFrom), so a save racing the stream leaves nothing stale;
// readings from before the worker's last look are the saving side's job (the web calls
// recomputeFrom when it saves a calibration).
import type { Db } from "../../db/client";
import { errorText, type Logger } from "../log";
import { recomputeFrom } from "../recompute";
import type { CalibrationBook } from "./calibrations";
import type { HoldBook } from "./holds";
import type { Pipeline } from "./pipeline";
import type { Registry } from "./registry";

export class Refresher {
  private running: Promise<void> | null = null;
  private again = false;
  private forceNext = false;
  private polls = 0;
  private timer: NodeJS.Timeout | null = null;
  /** Rows committed during the refresh before the last one (see once()). */
  private previous = new Map<number, number>();

  constructor(
    private readonly d: { db: Db; registry: Registry; calibrations: CalibrationBook; holds: HoldBook; pipeline: Pipeline; log: Logger },
  ) {}

  start(everyMs: number): void {
    this.timer = setInterval(() => this.refresh(false), everyMs);
  }

  stop(): void {
    if (this.timer) clearInterval(this.timer);
  }

  /**
   * Refreshes now; a request during a refresh runs one more right after it. `force` (an org
   * event said something changed) re-reads everything; a poll re-reads the calibrations only
   * when their fingerprint moved, and the probe registry every fifth time.
   */
  refresh(force = true): Promise<void> {
    this.forceNext ||= force;
    if (this.running) {
      this.again = true;
      return this.running;
    }
    const forced = this.forceNext;
    this.forceNext = false;
    this.running = this.once(forced)
      .catch((err: unknown) => this.d.log.error("refresh failed", errorText(err)))
      .finally(() => {
        this.running = null;
        if (this.again) {
          this.again = false;
          void this.refresh(this.forceNext);
        }
      });
    return this.running;
  }

  private async once(force: boolean) {
    const { pipeline, registry } = this.d;
    // Taken before the new view is read: rows committed up to now may have used the old one.
    // The generation before is kept too: a change committed while the previous refresh was
    // reading (after it started, before it read that table) was missed by it, and rows it
    // affected may already have been counted in that refresh's snapshot.
    const committed = mergeFirsts(this.previous, pipeline.committedSinceRefresh);
    this.previous = new Map(pipeline.committedSinceRefresh);
    pipeline.committedSinceRefresh.clear();
    if (force || this.polls++ % 5 === 0) await registry.refresh();
    const changedProbes = await this.d.calibrations.refresh(force);
    const changedTanks = await this.d.holds.refresh();
    for (const [tankId, at] of changedTanks) {
      for (const p of registry.snap.probesById.values()) {
        if (p.tankId === tankId) changedProbes.set(p.id, Math.min(changedProbes.get(p.id) ?? Infinity, at));
      }
    }
    if (changedProbes.size === 0) return;
    // Rows corrected with the old view but not yet committed are committed first.
    await pipeline.flush();
    for (const [probeId, at] of changedProbes) {
      const firsts = [committed.get(probeId), pipeline.committedSinceRefresh.get(probeId)].filter((v): v is number => v !== undefined);
      if (firsts.length === 0) continue;
      const from = Math.max(at, Math.min(...firsts));
      const r = await pipeline.exclusive(() => recomputeFrom(this.d.db, probeId, from));
      if (r.updated) this.d.log.info(`recomputed ${r.updated} readings of probe ${probeId} from ${new Date(from).toISOString()} after a change`);
    }
  }
}

/** Per probe, the earlier of the two first-committed times. */
function mergeFirsts(a: Map<number, number>, b: Map<number, number>): Map<number, number> {
  const out = new Map(a);
  for (const [k, v] of b) out.set(k, Math.min(out.get(k) ?? Infinity, v));
  return out;
}
