// The pipeline's hook contract with the writer and the alert rules on threads of their own: the
// next batch is written while the previous batch's hook runs, yet hook calls stay one at a time and
// in commit order, flush() waits for the last hook, and messages are acknowledged only after their
// batch committed. The writer and the hook are stand-ins with controllable timing (this is a unit
// test of the Pipeline class; the integration tests run it on SQLite and a real broker).
import { describe, expect, it } from "vitest";
import { Pipeline } from "@/ingest/worker/pipeline";
import { Registry, type RegistrySnapshot } from "@/ingest/worker/registry";
import { CalibrationBook } from "@/ingest/worker/calibrations";
import { HoldBook } from "@/ingest/worker/holds";
import { TankTemperatures } from "@/ingest/worker/temperatures";
import { Refusals } from "@/ingest/worker/refusals";
import { IngestMetrics } from "@/ingest/worker/health";
import type { ReadingWriter } from "@/ingest/worker/batch-writer";
import type { PackedReadings } from "@/ingest/packed-readings";

const CONTROLLER = "ctl-unit";
const TOPIC = `tw/v1/dev/${CONTROLLER}/raw`;
const NO_DB = null as never; // the books are only read here; their refresh needs the database

function snapshot(): RegistrySnapshot {
  const probe = { id: 1, serial: "TS-1", kind: "temp" as const, tankId: 1, status: "active" as const, retiredAt: null, nominalCellConstant: null };
  return {
    probesBySerial: new Map([[probe.serial, probe]]),
    probesById: new Map([[probe.id, probe]]),
    tanks: new Map([[1, { id: 1, orgId: 1, siteId: 1, alphaPerC: 0.02, intervalDays: 30 }]]),
    tankOfController: new Map([[CONTROLLER, 1]]),
  };
}

/** A promise with its resolve function, for steps the test releases one by one. */
function gate() {
  let open: () => void = () => undefined;
  const opened = new Promise<void>((r) => (open = r));
  return { opened, open };
}

/** Waits (a few ms at a time, up to 5 s) until `cond` holds. */
async function until(what: string, cond: () => boolean) {
  for (const started = Date.now(); !cond(); await new Promise((r) => setTimeout(r, 2))) {
    if (Date.now() - started > 5000) throw new Error(`timed out waiting for ${what}`);
  }
}

describe("the pipeline's hooks", () => {
  it("writes the next batch while the last one's hook runs, with hooks one at a time in commit order", async () => {
    const log: string[] = [];
    const writeGates = [gate(), gate(), gate()];
    const hookGates = [gate(), gate(), gate()];
    let writes = 0;
    const writer: ReadingWriter = {
      async write(rows: PackedReadings) {
        const n = ++writes;
        log.push(`write ${n} start`);
        await writeGates[n - 1].opened;
        log.push(`write ${n} end`);
        return rows;
      },
      async writeStatus() {},
      close() {},
    };
    let running = 0;
    let most = 0;
    const hooked: number[][] = [];
    const onCommitted = async (readings: PackedReadings) => {
      running++;
      most = Math.max(most, running);
      const n = hooked.push(Array.from({ length: readings.length }, (_, i) => readings.ts(i)));
      log.push(`hook ${n} start`);
      await hookGates[n - 1].opened;
      log.push(`hook ${n} end`);
      running--;
    };
    const acked: number[] = [];
    const pipeline = new Pipeline({
      registry: new Registry(NO_DB, snapshot()),
      calibrations: new CalibrationBook(NO_DB, new Map()),
      holds: new HoldBook(NO_DB, new Map()),
      temperatures: new TankTemperatures(),
      refusals: new Refusals(),
      writer,
      metrics: new IngestMetrics(),
      publish: () => undefined,
      ackAll: (acks) => acked.push(...acks),
      onCommitted,
      log: { info: () => undefined, warn: () => undefined, error: () => undefined },
      flushMs: 5,
      batchRows: 1, // every message is a batch of its own
      maxPendingRows: 1000,
      retentionDays: 30,
    });
    const t0 = Date.now() - 60_000;
    const send = (k: number) =>
      pipeline.accept(TOPIC, Buffer.from(JSON.stringify({ v: 1, seq: k, samples: [{ serial: "TS-1", ts: t0 + k * 1000, signal: 20 + k / 10 }] })), k);

    send(0);
    const flushed = pipeline.flush();
    await until("the first write", () => log.includes("write 1 start"));
    send(1);
    writeGates[0].open();
    // Batch 1 committed and acknowledged; its hook runs, and batch 2 is written meanwhile.
    await until("the second write", () => log.includes("write 2 start"));
    expect(log).toEqual(["write 1 start", "write 1 end", "hook 1 start", "write 2 start"]);
    expect(acked).toEqual([0]);
    send(2);
    writeGates[1].open();
    await until("the second commit", () => acked.includes(1));
    // Batch 2 is committed, but its hook waits for batch 1's.
    expect(log).not.toContain("hook 2 start");
    hookGates[0].open();
    await until("the second hook", () => log.includes("hook 2 start"));
    writeGates[2].open();
    hookGates[1].open();
    hookGates[2].open();
    await flushed;

    expect(most).toBe(1);
    expect(hooked).toEqual([[t0], [t0 + 1000], [t0 + 2000]]);
    expect(acked).toEqual([0, 1, 2]);
    expect(log.at(-1)).toBe("hook 3 end"); // flush() resolved only after the last hook
    for (let n = 1; n <= 3; n++) expect(log.indexOf(`write ${n} end`)).toBeLessThan(log.indexOf(`hook ${n} start`));
  });
});
