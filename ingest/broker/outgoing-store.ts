// aedes-persistence (in memory) keeps each session's outgoing QoS 1 queue in an array and
// finds a packet by scanning it, on every delivery and every acknowledgement. The ingest
// acknowledges after commit, so its queue holds thousands of packets at full rate, and after
// an ingest restart it may hold minutes of backlog: the scans then cost more than everything
// else the broker does. This store keeps the same queue in insertion-ordered Maps with
// indexes by (broker id, broker counter) and by message id, so each of those steps is O(1).
// It replaces only the outgoing-queue methods (through `withOverrides`); everything else stays
// aedes-persistence's.
import { Readable } from "node:stream";

/** The fields of an aedes packet that a queued copy keeps (as aedes-packet's constructor does). */
export interface QueuedPacket {
  cmd: string;
  brokerId?: string;
  brokerCounter?: number;
  topic?: string;
  payload?: unknown;
  qos?: number;
  retain?: boolean;
  dup?: boolean;
  messageId?: number;
  [key: string]: unknown;
}

function copyForQueue(p: QueuedPacket): QueuedPacket {
  const q: QueuedPacket = {
    cmd: p.cmd || "publish",
    brokerId: p.brokerId,
    brokerCounter: p.brokerCounter ?? 0,
    topic: p.topic,
    payload: p.payload ?? Buffer.alloc(0),
    qos: p.qos ?? 0,
    retain: p.retain ?? false,
    dup: p.dup ?? false,
    messageId: undefined, // assigned by aedes when it sends the copy [MQTT-2.3.1-1]
  };
  for (const k of ["clientId", "nl", "properties", "messageExpiry"]) if (Object.hasOwn(p, k)) q[k] = p[k];
  return q;
}

/**
 * Queue positions by broker id, then broker counter: numbers as keys, and no key string built
 * for every packet (the same broker id is one string, its hash computed once).
 */
class BrokerIndex {
  private readonly byBroker = new Map<string | undefined, Map<number | undefined, number>>();

  get(p: QueuedPacket): number | undefined {
    return this.byBroker.get(p.brokerId)?.get(p.brokerCounter);
  }

  set(p: QueuedPacket, id: number) {
    let counters = this.byBroker.get(p.brokerId);
    if (!counters) {
      counters = new Map();
      this.byBroker.set(p.brokerId, counters);
    }
    counters.set(p.brokerCounter, id);
  }

  delete(p: QueuedPacket) {
    const counters = this.byBroker.get(p.brokerId);
    if (!counters) return;
    counters.delete(p.brokerCounter);
    if (counters.size === 0) this.byBroker.delete(p.brokerId);
  }
}

class ClientQueue {
  private next = 0;
  readonly entries = new Map<number, QueuedPacket>(); // in enqueue order
  private readonly byBroker = new BrokerIndex();
  private readonly byMessageId = new Map<number, number>();

  push(p: QueuedPacket) {
    const id = this.next++;
    this.entries.set(id, p);
    this.byBroker.set(p, id);
  }

  /** aedes-persistence's outgoingUpdate: match by broker id and counter, else by message id. */
  update(p: QueuedPacket) {
    const id = this.byBroker.get(p);
    if (id !== undefined) {
      const entry = this.entries.get(id)!;
      if (entry.messageId !== undefined) this.byMessageId.delete(entry.messageId);
      entry.messageId = p.messageId;
      if (p.messageId !== undefined) this.byMessageId.set(p.messageId, id);
      return;
    }
    const byId = p.messageId === undefined ? undefined : this.byMessageId.get(p.messageId);
    if (byId !== undefined) {
      // A packet replacing another under the same message id (QoS 2 PUBREL for its PUBLISH).
      const old = this.entries.get(byId)!;
      this.byBroker.delete(old);
      this.entries.set(byId, p);
      this.byBroker.set(p, byId);
      return;
    }
    throw new Error("no such packet");
  }

  clear(messageId: number | undefined): QueuedPacket | undefined {
    if (messageId === undefined) return undefined;
    const id = this.byMessageId.get(messageId);
    if (id === undefined) return undefined;
    const entry = this.entries.get(id)!;
    this.byMessageId.delete(messageId);
    this.byBroker.delete(entry);
    this.entries.delete(id);
    return entry;
  }
}

export class OutgoingStore {
  private readonly queues = new Map<string, ClientQueue>();

  private queue(clientId: string): ClientQueue {
    let q = this.queues.get(clientId);
    if (!q) {
      q = new ClientQueue();
      this.queues.set(clientId, q);
    }
    return q;
  }

  /** The methods that replace aedes-persistence's, same names and contracts. */
  readonly methods = {
    outgoingEnqueue: async (sub: { clientId: string }, packet: QueuedPacket) => {
      this.queue(sub.clientId).push(copyForQueue(packet));
    },
    outgoingEnqueueCombi: async (subs: { clientId: string }[], packet: QueuedPacket) => {
      for (const sub of subs) this.queue(sub.clientId).push(copyForQueue(packet));
    },
    outgoingUpdate: async (client: { id: string }, packet: QueuedPacket) => {
      this.queue(client.id).update(packet);
    },
    outgoingClearMessageId: async (client: { id: string }, packet: { messageId?: number }) => {
      return this.queue(client.id).clear(packet.messageId);
    },
    outgoingStream: (client: { id: string }) => {
      // A snapshot, as aedes-persistence gives: later changes do not disturb the stream.
      return Readable.from([...(this.queues.get(client.id)?.entries.values() ?? [])]);
    },
  };

  /** Queued packets for a client (for the graceful shutdown). */
  size(clientId: string): number {
    return this.queues.get(clientId)?.entries.size ?? 0;
  }
}

/**
 * Wraps a persistence so the methods named in `overrides` go there (the outgoing queue's to an
 * `OutgoingStore`'s `methods`, for instance); every other member is the original's (functions bound
 * to it, so `setup` stays an AsyncFunction as aedes requires).
 */
export function withOverrides<T extends object>(persistence: T, overrides: Record<string, unknown>): T {
  // aedes looks its persistence's methods up for every message: each is bound once, not per call.
  const bound = new Map<PropertyKey, { fn: (...args: unknown[]) => unknown; bound: unknown }>();
  return new Proxy(persistence, {
    get(target, prop, receiver) {
      if (typeof prop === "string" && Object.hasOwn(overrides, prop)) return overrides[prop];
      const value: unknown = Reflect.get(target, prop, receiver);
      if (typeof value !== "function") return value;
      let hit = bound.get(prop);
      if (hit?.fn !== value) {
        hit = { fn: value as (...args: unknown[]) => unknown, bound: value.bind(target) };
        bound.set(prop, hit);
      }
      return hit.bound;
    },
  });
}
