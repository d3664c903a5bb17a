// One tank controller on the broker: its own credentials, QoS 1 raw messages with a sequence
// number, and the retained dosing command it obeys. mqtt.js queues QoS 1 messages while the
// broker is away and resends them on reconnect, so a broker restart loses nothing.
import mqtt, { type MqttClient } from "mqtt";
import { dosingCommand, type DosingCommand, type RawMessage } from "../../ingest/payloads";
import { deviceClientId, topics } from "../../ingest/topics";
import type { DeviceCredential } from "./fleet";

export interface PublishCounters {
  messages: number;
  samples: number;
  failed: number;
  pending: number;
}

export class Device {
  private client: MqttClient | null = null;
  private seq = 0;
  private dosing: DosingCommand | null = null;
  private offline = false;
  private markSubscribed: () => void = () => undefined;
  /** Resolves once the broker has confirmed the subscription to this controller's commands. */
  readonly subscribed = new Promise<void>((resolve) => (this.markSubscribed = resolve));

  constructor(
    readonly credential: DeviceCredential,
    private readonly url: string,
    private readonly counters: PublishCounters,
    private readonly log: (line: string) => void,
  ) {}

  connect(): void {
    const c = this.credential;
    const client = mqtt.connect(this.url, {
      username: c.username,
      password: c.password,
      // A device's client id is its controller id or starts with it (the broker checks).
      clientId: deviceClientId(c.controllerId, `sim-${process.pid}`),
      clean: true,
      reconnectPeriod: 500,
      connectTimeout: 10_000,
      keepalive: 30,
    });
    client.on("connect", () => {
      client.subscribe(topics.commandWildcard(c.controllerId), { qos: 1 }, (err) => {
        if (err) this.log(`${c.controllerId}: command subscription refused: ${err.message}`);
        else this.markSubscribed();
      });
    });
    client.on("message", (topic, payload) => {
      if (topic !== topics.dosingCommand(c.controllerId)) return;
      let json: unknown;
      try {
        json = JSON.parse(payload.toString("utf8"));
      } catch {
        json = null;
      }
      const parsed = dosingCommand.safeParse(json);
      if (!parsed.success) return this.log(`${c.controllerId}: ignored an invalid dosing command`);
      this.dosing = parsed.data;
      this.log(`${c.controllerId}: dosing ${parsed.data.inhibit ? "inhibited" : "resumed"}${parsed.data.reason ? ` (${parsed.data.reason})` : ""}`);
    });
    client.on("error", (err) => this.log(`${c.controllerId}: ${err.message}`));
    this.client = client;
  }

  /** Dosing is off while an inhibit command is in force (until its `until`, when it has one). */
  dosingInhibited(now: number): boolean {
    const d = this.dosing;
    return !!d && d.inhibit && (d.until === null || now < d.until);
  }

  get isOffline() {
    return this.offline;
  }

  /** Goes offline (stops publishing and disconnects) or comes back. */
  setOffline(offline: boolean): void {
    if (offline === this.offline) return;
    this.offline = offline;
    this.log(`${this.credential.controllerId}: ${offline ? "going offline" : "back online"}`);
    if (offline) this.client?.end(false);
    else if (this.client) this.client.reconnect();
  }

  publish(samples: RawMessage["samples"]): void {
    if (this.offline || !this.client) return;
    const message: RawMessage = { v: 1, seq: this.seq++, samples };
    const n = samples.length;
    this.counters.pending++;
    this.client.publish(topics.raw(this.credential.controllerId), JSON.stringify(message), { qos: 1 }, (err) => {
      this.counters.pending--;
      if (err) {
        this.counters.failed += n;
        return;
      }
      // Counted once the broker acknowledged it: the ingest will store exactly these.
      this.counters.messages++;
      this.counters.samples += n;
    });
  }

  close(): Promise<void> {
    return new Promise((resolve) => (this.client ? this.client.end(false, {}, () => resolve()) : resolve()));
  }
}
