// One broker subscription per web process, shared by every live stream: a lazily connected
// MQTT client that fans calibrated readings and organisation events out to in-process listeners
// (one per group of streams of the same scope, server/stream/fan-out.ts, not one per stream).
import { connect, type MqttClient } from "mqtt";
import { orgEvent, readingBatch, type CalibratedReading, type OrgEvent } from "@/ingest/payloads";
import { SERVICE_ACCOUNTS, mqttUrl, topics } from "@/ingest/topics";

export type LiveMessage =
  | { kind: "readings"; orgId: number; tankId: number; readings: CalibratedReading[] }
  | { kind: "event"; event: OrgEvent }
  // The broker connection came back after a drop: listeners fill the gap from the database.
  | { kind: "resync" };

export type LiveListener = (message: LiveMessage) => void;

const READING_TOPIC = /^tw\/v1\/org\/(\d+)\/tank\/(\d+)\/reading$/;
const EVENT_TOPIC = /^tw\/v1\/org\/(\d+)\/event$/;

class LiveHub {
  private client: MqttClient | null = null;
  private listeners = new Set<LiveListener>();
  private wasConnected = false;
  private dropped = false;

  /** Adds a listener (connecting to the broker on first use); returns its removal. */
  listen(listener: LiveListener): () => void {
    this.ensureClient();
    this.listeners.add(listener);
    return () => {
      this.listeners.delete(listener);
    };
  }

  get listenerCount() {
    return this.listeners.size;
  }

  get connected() {
    return this.client?.connected ?? false;
  }

  private ensureClient() {
    if (this.client) return;
    const client = connect(mqttUrl(), {
      username: SERVICE_ACCOUNTS.web.username,
      password: SERVICE_ACCOUNTS.web.password(),
      clientId: `tidewell-web-${process.pid}-${Math.random().toString(36).slice(2, 8)}`,
      reconnectPeriod: 1000,
      connectTimeout: 5000,
      clean: true,
    });
    client.on("connect", () => {
      client.subscribe([topics.readingWildcard, topics.eventWildcard], { qos: 0 }, (err) => {
        if (err) console.error("[live-hub] subscribe failed", err.message);
      });
      if (this.wasConnected && this.dropped) this.emit({ kind: "resync" });
      this.wasConnected = true;
      this.dropped = false;
    });
    client.on("close", () => {
      if (this.wasConnected) this.dropped = true;
    });
    client.on("error", (err) => console.error("[live-hub] broker error", err.message));
    client.on("message", (topic, payload) => this.onMessage(topic, payload));
    this.client = client;
  }

  private onMessage(topic: string, payload: Buffer) {
    const reading = READING_TOPIC.exec(topic);
    if (reading) {
      const parsed = readingBatch.safeParse(safeJson(payload));
      if (!parsed.success) return;
      const orgId = Number(reading[1]);
      const tankId = Number(reading[2]);
      // The topic names the scope; readings that claim another organisation or tank are dropped.
      const readings = parsed.data.readings.filter((r) => r.orgId === orgId && r.tankId === tankId);
      if (readings.length) this.emit({ kind: "readings", orgId, tankId, readings });
      return;
    }
    const event = EVENT_TOPIC.exec(topic);
    if (event) {
      const parsed = orgEvent.safeParse(safeJson(payload));
      if (parsed.success && parsed.data.orgId === Number(event[1])) this.emit({ kind: "event", event: parsed.data });
    }
  }

  private emit(message: LiveMessage) {
    for (const listener of this.listeners) {
      try {
        listener(message);
      } catch (err) {
        console.error("[live-hub] listener failed", err);
      }
    }
  }
}

function safeJson(payload: Buffer): unknown {
  try {
    return JSON.parse(payload.toString("utf8"));
  } catch {
    return null;
  }
}

// Kept on globalThis: the custom server's modules and Next's bundle are separate module graphs in
// one process (and development reloads modules), yet there must be one broker subscription.
const HUB_KEY = Symbol.for("tidewell.liveHub");
const globalForHub = globalThis as unknown as { [HUB_KEY]?: LiveHub };

/** The process-wide hub. */
export function liveHub(): LiveHub {
  globalForHub[HUB_KEY] ??= new LiveHub();
  return globalForHub[HUB_KEY];
}
