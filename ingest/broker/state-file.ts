// The embedded broker keeps sessions in memory (aedes-persistence). So that a planned restart
// loses nothing, a graceful shutdown writes the retained messages (dosing commands) and the
// messages still queued for the ingest's persistent session to a small JSON file, and the next
// start loads them back before it accepts connections. A crash (kill -9) cannot do this: use an
// external broker with disk persistence (MQTT_URL) where that matters.
import fs from "node:fs";
import path from "node:path";
import { z } from "zod";

const spooledPacket = z.object({
  topic: z.string(),
  payload: z.string(), // base64
  qos: z.union([z.literal(0), z.literal(1), z.literal(2)]),
  retain: z.boolean(),
  brokerId: z.string().optional(),
  brokerCounter: z.number().optional(),
});
type SpooledPacket = z.infer<typeof spooledPacket>;

const stateFile = z.object({
  v: z.literal(1),
  savedAt: z.number(),
  retained: z.array(spooledPacket),
  queued: z.record(z.string(), z.array(spooledPacket)), // clientId → packets, oldest first
});

export interface PacketLike {
  topic: string;
  payload: Buffer | string;
  qos: 0 | 1 | 2;
  retain: boolean;
  brokerId?: string;
  brokerCounter?: number;
}

/** The slice of aedes-persistence's async interface used here. */
export interface SpoolPersistence {
  createRetainedStream(pattern: string): AsyncIterable<PacketLike>;
  storeRetained(packet: PacketLike & { cmd: "publish" }): Promise<void>;
  outgoingStream(client: { id: string }): AsyncIterable<PacketLike>;
  outgoingEnqueue(sub: { clientId: string }, packet: PacketLike & { cmd: "publish" }): Promise<void>;
}

const toSpool = (p: PacketLike): SpooledPacket => ({
  topic: p.topic,
  payload: Buffer.from(p.payload).toString("base64"),
  qos: p.qos,
  retain: p.retain,
  brokerId: p.brokerId,
  brokerCounter: p.brokerCounter,
});

export async function saveState(file: string, persistence: SpoolPersistence, clientIds: string[]): Promise<{ retained: number; queued: number }> {
  const retained: SpooledPacket[] = [];
  for await (const p of persistence.createRetainedStream("#")) retained.push(toSpool(p));
  const queued: Record<string, SpooledPacket[]> = {};
  let n = 0;
  for (const id of clientIds) {
    const list: SpooledPacket[] = [];
    for await (const p of persistence.outgoingStream({ id })) list.push(toSpool(p));
    if (list.length) queued[id] = list;
    n += list.length;
  }
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const tmp = `${file}.${process.pid}.tmp`;
  fs.writeFileSync(tmp, JSON.stringify({ v: 1, savedAt: Date.now(), retained, queued }), { mode: 0o600 });
  fs.renameSync(tmp, file); // atomic: a half-written file is never read
  return { retained: retained.length, queued: n };
}

/** Loads and deletes the state file; returns what it restored (zeros when there was none). */
export async function restoreState(file: string, persistence: SpoolPersistence): Promise<{ retained: number; queued: number }> {
  if (!fs.existsSync(file)) return { retained: 0, queued: 0 };
  const parsed = stateFile.safeParse(JSON.parse(fs.readFileSync(file, "utf8")));
  fs.rmSync(file, { force: true });
  if (!parsed.success) throw new Error(`broker state file ${file} is not valid; ignored`);
  const fromSpool = (p: SpooledPacket) => ({
    cmd: "publish" as const,
    topic: p.topic,
    payload: Buffer.from(p.payload, "base64"),
    qos: p.qos,
    retain: p.retain,
    // A restored packet keeps a broker id of its own so aedes can match its acknowledgement.
    brokerId: `spool-${p.brokerId ?? "x"}`,
    brokerCounter: p.brokerCounter ?? 0,
  });
  for (const p of parsed.data.retained) await persistence.storeRetained(fromSpool(p));
  let n = 0;
  for (const [clientId, list] of Object.entries(parsed.data.queued)) {
    for (const p of list) await persistence.outgoingEnqueue({ clientId }, fromSpool(p));
    n += list.length;
  }
  return { retained: parsed.data.retained.length, queued: n };
}
