// Counting what the ingest refused, per reason, and keeping a bounded sample of each reason
// for diagnosis: the latest sample per reason is written to dead_letters with the next batch
// (so a flood costs one row per reason per batch), and older rows beyond the bound are pruned.
import { REFUSAL_REASONS, type RefusalReason } from "../payloads";

const SAMPLE_BYTES = 2048;

export interface DeadLetter {
  at: number;
  topic: string;
  reason: RefusalReason;
  sample: string;
}

export class Refusals {
  readonly counts: Record<RefusalReason, number> = Object.fromEntries(REFUSAL_REASONS.map((r) => [r, 0])) as Record<RefusalReason, number>;
  private pending = new Map<RefusalReason, DeadLetter>();

  get total(): number {
    return REFUSAL_REASONS.reduce((n, r) => n + this.counts[r], 0);
  }

  record(reason: RefusalReason, topic: string, sample: Uint8Array | string, at = Date.now()): void {
    this.counts[reason]++;
    this.pending.set(reason, { at, topic: topic.slice(0, 256), reason, sample: sampleText(sample) });
  }

  /** The dead letters to write with the next batch (and forget them). */
  take(): DeadLetter[] {
    const out = [...this.pending.values()];
    this.pending.clear();
    return out;
  }

  /** Puts dead letters back after a failed write (newer samples of a reason win). */
  restore(letters: DeadLetter[]): void {
    for (const l of letters) if (!this.pending.has(l.reason)) this.pending.set(l.reason, l);
  }

  /** Counts without zero entries, for the health snapshot. */
  nonZero(): Record<string, number> {
    return Object.fromEntries(REFUSAL_REASONS.filter((r) => this.counts[r] > 0).map((r) => [r, this.counts[r]]));
  }
}

function sampleText(sample: Uint8Array | string): string {
  const text = typeof sample === "string" ? sample : Buffer.from(sample.subarray(0, SAMPLE_BYTES)).toString("utf8");
  const size = typeof sample === "string" ? sample.length : sample.length;
  return size > SAMPLE_BYTES ? `${text.slice(0, SAMPLE_BYTES)}… (${size} bytes)` : text;
}
