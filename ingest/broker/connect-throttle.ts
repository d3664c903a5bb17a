// Failed connects, counted per key (a source address, a username). After `freeFailures` within
// `windowMs`, the key is refused without checking its password for a doubling interval (from
// `baseBlockMs` up to `maxBlockMs`), so a flood of wrong passwords cannot keep the broker hashing.
// A success clears the key. Memory stays bounded: stale keys are pruned as the map grows.
// Checks of one key also take turns (`turn`, at most `concurrent` at once): a burst of parallel
// connects is counted as it goes rather than all hashed before the first failure is recorded.

export interface ThrottleLimits {
  freeFailures: number;
  concurrent: number;
  windowMs: number;
  baseBlockMs: number;
  maxBlockMs: number;
}

export const DEFAULT_THROTTLE: ThrottleLimits = { freeFailures: 5, concurrent: 1, windowMs: 60_000, baseBlockMs: 1_000, maxBlockMs: 60_000 };

interface Entry {
  failures: number;
  lastFailureAt: number;
  blockedUntil: number;
}

const PRUNE_AT = 10_000;

export class ConnectThrottle {
  private entries = new Map<string, Entry>();
  private turns = new Map<string, { running: number; waiting: (() => void)[] }>();

  constructor(private readonly limits: ThrottleLimits = DEFAULT_THROTTLE) {}

  /** Waits for a turn to check a connect of `key`; call the returned function when done. */
  async turn(key: string): Promise<() => void> {
    let t = this.turns.get(key);
    if (!t) this.turns.set(key, (t = { running: 0, waiting: [] }));
    const gate = t;
    if (gate.running >= this.limits.concurrent) await new Promise<void>((resolve) => gate.waiting.push(resolve));
    else gate.running++;
    let done = false;
    return () => {
      if (done) return;
      done = true;
      const next = gate.waiting.shift();
      if (next) next(); // the turn passes on; `running` is unchanged
      else if (--gate.running === 0) this.turns.delete(key);
    };
  }

  /** How long `key` is still refused unheard, in ms (0: it may try). */
  blockedFor(key: string, now = Date.now()): number {
    const e = this.entries.get(key);
    return e ? Math.max(0, e.blockedUntil - now) : 0;
  }

  failed(key: string, now = Date.now()): void {
    let e = this.entries.get(key);
    if (!e || (e.blockedUntil <= now && now - e.lastFailureAt > this.limits.windowMs)) {
      e = { failures: 0, lastFailureAt: now, blockedUntil: 0 };
    }
    e.failures += 1;
    e.lastFailureAt = now;
    const over = e.failures - this.limits.freeFailures;
    if (over >= 0) e.blockedUntil = now + Math.min(this.limits.maxBlockMs, this.limits.baseBlockMs * 2 ** Math.min(over, 30));
    this.entries.set(key, e);
    if (this.entries.size > PRUNE_AT) this.prune(now);
  }

  succeeded(key: string): void {
    this.entries.delete(key);
  }

  get size(): number {
    return this.entries.size;
  }

  private prune(now: number): void {
    for (const [key, e] of this.entries) {
      if (e.blockedUntil <= now && now - e.lastFailureAt > this.limits.windowMs) this.entries.delete(key);
    }
  }
}
