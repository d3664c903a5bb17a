// The ingest's hot path: validate each raw message, correct its samples, batch them, commit a
// batch in one transaction, then acknowledge its MQTT messages, stream its new readings and
// hand them to the alert hook. One flush runs at a time; messages keep arriving meanwhile.
import { controllerOfRawTopic, topics } from "../topics";
import { isFuture, type RawSample, type RefusalReason } from "../payloads";
import type { IngestHooks } from "../hooks";
import { errorText, type Logger } from "../log";
import type { ReadingWriter } from "./batch-writer";
import type { CalibrationBook } from "./calibrations";
import { correct, isPhysical } from "./correct";
import { decodeRaw } from "./decode";
import { encodeReadingBatch } from "./live-batch";
import type { IngestMetrics } from "./health";
import type { HoldBook } from "./holds";
import type { ProbeInfo, Registry } from "./registry";
import { PackedReadingsBuilder, type PackedReadings } from "../packed-readings";
import type { AckToken } from "./mqtt-session";
import type { Refusals } from "./refusals";
import type { TankTemperatures } from "./temperatures";

export interface PipelineDeps {
  registry: Registry;
  calibrations: CalibrationBook;
  holds: HoldBook;
  temperatures: TankTemperatures;
  refusals: Refusals;
  writer: ReadingWriter;
  metrics: IngestMetrics;
  publish: (topic: string, payload: string) => void;
  /** Sends the acknowledgements of a batch together (corks the broker connection). */
  ackAll: (acks: AckToken[]) => void;
  onCommitted: IngestHooks["onReadingsCommitted"];
  log: Logger;
  flushMs: number;
  batchRows: number;
  maxPendingRows: number;
  retentionDays: number;
  now?: () => number;
}

interface Batch {
  rows: PackedReadingsBuilder;
  /** Numbers, not a closure a message: they live as long as the batch (see ../packed-readings.ts). */
  acks: AckToken[];
  /** Messages in the batch, QoS 0 ones (no acknowledgement) included. */
  messages: number;
}

const DAY_MS = 86_400_000;
const SEEN_EVERY_MS = 10_000; // how often a device's last_seen_at is written at most
// Samples of one message are corrected temperature first, so pH and EC use this tick's temperature.
const ORDER: Record<ProbeInfo["kind"], number> = { temp: 0, ph: 1, ec: 2 };

export class Pipeline {
  private current: Batch = { rows: new PackedReadingsBuilder(), acks: [], messages: 0 };
  /** The rows of a batch whose commit failed, written again before the rows that came since. */
  private retry: PackedReadings | null = null;
  private inFlight = 0; // rows of the batch being written
  private timer: NodeJS.Timeout | null = null;
  private flushing: Promise<void> | null = null;
  private waiters: (() => void)[] = [];
  private lastSeq = new Map<string, number>();
  private seenWritten = new Map<string, number>();
  private seenPending = new Map<string, number>();
  private lastFailureLog = 0;
  private writeLock: Promise<unknown> = Promise.resolve();
  /** The hook call of the last committed batch (never rejects: runHook counts errors). */
  private hookRunning: Promise<void> = Promise.resolve();
  /** Per probe, the earliest ts committed since the calibrations were last loaded. */
  readonly committedSinceRefresh = new Map<number, number>();
  private readonly now: () => number;

  constructor(private readonly d: PipelineDeps) {
    this.now = d.now ?? Date.now;
  }

  /** Rows received and not yet committed. */
  private get pendingRows() {
    return this.current.rows.length + this.inFlight + (this.retry?.length ?? 0);
  }

  get queueDepth() {
    return { samples: this.pendingRows, messages: this.current.messages };
  }

  /**
   * One raw message from the broker. Returns a promise when the worker is too far behind:
   * the session then stops reading from the broker until it settles.
   */
  accept(topic: string, payload: Buffer, ack: AckToken | null): Promise<void> | void {
    const m = this.d.metrics;
    m.messagesTotal++;
    this.current.messages++;
    if (ack !== null) this.current.acks.push(ack);
    this.ingest(topic, payload);
    if (this.current.rows.length >= this.d.batchRows) void this.flush();
    else this.timer ??= setTimeout(() => void this.flush(), this.d.flushMs);
    if (this.pendingRows > this.d.maxPendingRows) {
      return new Promise<void>((resolve) => this.waiters.push(resolve));
    }
  }

  private refuse(reason: RefusalReason, topic: string, sample: Buffer | string) {
    this.d.refusals.record(reason, topic, sample, this.now());
  }

  private ingest(topic: string, payload: Buffer) {
    const controllerId = controllerOfRawTopic(topic);
    if (!controllerId) return this.refuse("invalid-schema", topic, payload);
    const decoded = decodeRaw(payload);
    if (!decoded.ok) return this.refuse(decoded.reason, topic, payload);
    const snap = this.d.registry.snap;
    const tankId = snap.tankOfController.get(controllerId);
    const tank = tankId === undefined ? undefined : snap.tanks.get(tankId);
    if (!tank) {
      this.d.registry.refreshAfterMiss();
      return this.refuse("unknown-controller", topic, payload);
    }
    const now = this.now();
    this.trackSeq(controllerId, decoded.message.seq);
    this.seenPending.set(controllerId, now);

    const accepted: { s: RawSample; p: ProbeInfo }[] = [];
    for (const s of decoded.message.samples) {
      const p = snap.probesBySerial.get(s.serial);
      const reason = this.sampleRefusal(s, p, tank.id, now);
      if (reason) {
        if (reason === "unknown-probe") this.d.registry.refreshAfterMiss(now);
        this.refuse(reason, topic, JSON.stringify({ controllerId, sample: s }));
        continue;
      }
      accepted.push({ s, p: p! });
    }
    if (accepted.length > 1) accepted.sort((a, b) => ORDER[a.p.kind] - ORDER[b.p.kind]);

    for (const { s, p } of accepted) {
      const c = correct({
        kind: p.kind,
        raw: s.signal,
        ts: s.ts,
        tempC: p.kind === "temp" ? null : this.d.temperatures.at(tank.id, s.ts),
        calibration: p.kind === "temp" ? null : this.d.calibrations.inForce(p.id, s.ts),
        nominalCellConstant: p.nominalCellConstant,
        alphaPerC: tank.alphaPerC,
        intervalDays: tank.intervalDays,
        held: this.d.holds.held(tank.id, p.id, s.ts),
      });
      // Whatever its flag (a held tank still has a temperature), an impossible value never compensates.
      if (p.kind === "temp" && c.value !== null && isPhysical("temp", c.value)) this.d.temperatures.record(tank.id, s.ts, c.value);
      this.current.rows.push(tank.orgId, tank.id, p.id, p.kind, s.ts, s.signal, c.value, c.quality, c.calibrationRunId);
    }
  }

  private sampleRefusal(s: RawSample, p: ProbeInfo | undefined, tankId: number, now: number): RefusalReason | null {
    if (!p) return "unknown-probe";
    if (p.tankId !== tankId) return "probe-not-on-this-controller";
    if (p.status === "retired" || (p.retiredAt !== null && s.ts >= p.retiredAt)) return "retired-probe";
    if (isFuture(s.ts, now)) return "future-timestamp";
    if (s.ts < now - this.d.retentionDays * DAY_MS) return "expired-timestamp";
    return null;
  }

  private trackSeq(controllerId: string, seq: number) {
    const high = this.lastSeq.get(controllerId);
    // 0 is a device (re)start. Lower numbers are redeliveries arriving after newer messages:
    // not gaps. Only a jump above the highest number seen counts what went missing.
    if (high === undefined || seq === 0) this.lastSeq.set(controllerId, seq);
    else if (seq > high) {
      this.d.metrics.seqGaps += seq - high - 1;
      this.lastSeq.set(controllerId, seq);
    }
  }

  /** Commits everything received so far (resolves when the loop is idle again). */
  flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.flushing ??= this.loop().finally(() => (this.flushing = null));
    return this.flushing;
  }

  private get hasPending() {
    // A message whose every sample was refused still makes a batch: its refusals are written.
    return this.current.rows.length > 0 || this.current.messages > 0 || this.retry !== null;
  }

  private async loop() {
    do {
      await this.writeAll();
      // flush() resolves once the last batch's hook is done too; rows that came meanwhile go next.
      await this.hookRunning;
    } while (this.hasPending);
  }

  private async writeAll() {
    while (this.hasPending) {
      const taken = this.current.rows.take();
      const rows = this.retry ? this.retry.concat(taken) : taken;
      const acks = this.current.acks;
      const messages = this.current.messages;
      this.retry = null;
      this.current.acks = [];
      this.current.messages = 0;
      this.inFlight = rows.length;
      const letters = this.d.refusals.take();
      const seen = this.takeSeen();
      const started = this.now();
      let inserted: PackedReadings;
      try {
        inserted = await this.exclusive(() => this.d.writer.write(rows, letters, seen));
      } catch (err) {
        // Nothing was acknowledged: keep the batch, wait, and try again (the broker still holds
        // the messages, so even a restart now loses nothing).
        this.d.refusals.restore(letters);
        for (const [k, v] of seen) if (!this.seenPending.has(k)) this.seenPending.set(k, v);
        this.retry = rows;
        this.current.acks = acks.concat(this.current.acks);
        this.current.messages += messages;
        this.inFlight = 0;
        if (this.now() - this.lastFailureLog > 5000) {
          this.lastFailureLog = this.now();
          this.d.log.error(`commit of ${rows.length} rows failed; retrying`, err);
        }
        await new Promise((r) => setTimeout(r, 250));
        continue;
      }
      const committedAt = this.now();
      this.inFlight = 0;
      this.d.ackAll(acks);
      this.d.metrics.recordCommit(inserted, rows.length, committedAt, committedAt - started);
      for (let i = 0; i < inserted.length; i++) {
        const probeId = inserted.probeId(i);
        const ts = inserted.ts(i);
        const first = this.committedSinceRefresh.get(probeId);
        if (first === undefined || ts < first) this.committedSinceRefresh.set(probeId, ts);
      }
      this.releaseWaiters();
      if (inserted.length) {
        this.stream(inserted);
        // The hook may wait for the broker's PUBACK of its own publishes (incident events, dosing
        // commands), and a paused session reads nothing, PUBACKs included: reading resumes
        // before the hook runs, or the two would wait for each other for ever.
        this.releaseWaiters(true);
        // Hooks run one at a time and in commit order, but the next batch is written while this
        // one's hook runs (the writer and the alert rules have a thread each): wait for the hook
        // before this one, then go on to the next write without waiting for this one.
        await this.hookRunning;
        this.hookRunning = this.runHook(inserted);
      }
    }
  }

  /**
   * Runs `fn` while no batch is being written. Other writes of this process (recomputeFrom) go
   * through here: the writer's connection waits for SQLite's lock synchronously, so it must
   * never find the lock held by another connection of this same thread.
   */
  exclusive<T>(fn: () => Promise<T>): Promise<T> {
    const run = this.writeLock.then(fn, fn);
    this.writeLock = run.catch(() => undefined);
    return run;
  }

  private takeSeen(): Map<string, number> {
    const out = new Map<string, number>();
    for (const [id, at] of this.seenPending) {
      const written = this.seenWritten.get(id);
      if (written === undefined || at - written >= SEEN_EVERY_MS) {
        out.set(id, at);
        this.seenWritten.set(id, at);
      }
    }
    for (const id of out.keys()) this.seenPending.delete(id);
    return out;
  }

  private releaseWaiters(force = false) {
    if (!force && this.pendingRows > this.d.maxPendingRows / 2) return;
    const waiters = this.waiters;
    this.waiters = [];
    for (const w of waiters) w();
  }

  /** Publishes the new readings per tank on tw/v1/org/{orgId}/tank/{tankId}/reading. */
  private stream(rows: PackedReadings) {
    const byTank = new Map<number, number[]>();
    for (let i = 0; i < rows.length; i++) {
      const tankId = rows.tankId(i);
      const list = byTank.get(tankId);
      if (list) list.push(i);
      else byTank.set(tankId, [i]);
    }
    for (const [tankId, list] of byTank) this.d.publish(topics.reading(rows.orgId(list[0]), tankId), encodeReadingBatch(tankId, rows, list));
  }

  private async runHook(rows: PackedReadings) {
    try {
      await this.d.onCommitted(rows);
    } catch (err) {
      this.d.metrics.hookErrors++;
      this.d.log.error("onReadingsCommitted failed", errorText(err));
    }
  }
}
