// A lean load generator: one MQTT 3.1.1 connection per seeded controller (with its own
// credentials) publishing QoS 1 raw messages of the controller's three samples, timestamps 1 ms
// apart so every row is distinct. The simulator's physics is left out: the bench measures the
// pipeline, and this process shares the machine's two cores with the broker and the ingest.
//
// So it is written to cost little per message: the connection is a plain socket, packets are
// parsed by mqtt-packet (mqtt.js's own codec), a PUBLISH is framed by hand into one buffer, and
// each connection keeps `windowPerConnection` messages unacknowledged, sending the next ones in
// one write when PUBACKs arrive: pipelined, like a controller flushing what it held while offline.
//
// The loop is closed end to end: it listens to the live reading stream (as svc-web, like the web
// app) and keeps at most `maxOutstanding` samples published but not yet committed, so the rate it
// settles at is what the whole chain sustains, with the broker's queue bounded. `backlog()` then
// leaves the loop open: it publishes a fixed number of messages that the broker queues for a
// stopped ingest, for the bench to time how fast the ingest drains them.
import net from "node:net";
import mqtt, { type MqttClient } from "mqtt";
import mqttPacket from "mqtt-packet";
import { deviceClientId, SERVICE_ACCOUNTS, serviceClientId, topics } from "../../ingest/topics";

export interface PublisherTarget {
  controllerId: string;
  username: string;
  password: string;
  serials: string[];
}

const PUBLISH_QOS1 = 0x32;
const CLOSING_BRACE = 0x7d;

/**
 * Counts the readings in a live batch without parsing it: each reading is an object of numbers and
 * fixed words, so it closes one brace, and the batch itself one more. A search for one byte (memchr)
 * costs a tenth of a search for `"probeId":` at these rates.
 */
function countReadings(payload: Buffer): number {
  let n = -1;
  for (let at = payload.indexOf(CLOSING_BRACE); at !== -1; at = payload.indexOf(CLOSING_BRACE, at + 1)) n++;
  return Math.max(0, n);
}

/** MQTT's variable-length "remaining length" field. */
function remainingLength(n: number): number[] {
  const out: number[] = [];
  do {
    let byte = n % 128;
    n = Math.floor(n / 128);
    if (n > 0) byte |= 0x80;
    out.push(byte);
  } while (n > 0);
  return out;
}

/** A QoS 1 PUBLISH packet: fixed header, topic, packet id, payload. */
function publishPacket(topic: Buffer, packetId: number, payload: string): Buffer {
  const body = Buffer.byteLength(payload);
  const rest = 2 + topic.length + 2 + body;
  const header = remainingLength(rest);
  const packet = Buffer.allocUnsafe(1 + header.length + rest);
  let at = 0;
  packet[at++] = PUBLISH_QOS1;
  for (const b of header) packet[at++] = b;
  packet.writeUInt16BE(topic.length, at);
  at += 2;
  at += topic.copy(packet, at);
  packet.writeUInt16BE(packetId, at);
  at += 2;
  packet.write(payload, at, "utf8");
  return packet;
}

/**
 * What a device connection hears from the broker, read by hand: a CONNACK, then only PUBACKs (it
 * subscribes to nothing), each four bytes. mqtt-packet's parser made an object of every PUBACK.
 */
class AckReader {
  private rest: Buffer | null = null;

  constructor(private readonly onConnack: (returnCode: number) => void) {}

  /** Reads a chunk; returns the PUBACKs completed in it. */
  read(chunk: Buffer): number {
    const buf = this.rest ? Buffer.concat([this.rest, chunk]) : chunk;
    this.rest = null;
    let acks = 0;
    let at = 0;
    // Both packets are a type byte, a one-byte remaining length of 2, and two bytes.
    while (at + 4 <= buf.length) {
      const type = buf[at] >> 4;
      if (buf[at + 1] !== 2) throw new Error(`the broker sent a packet of type ${type} with ${buf[at + 1]} bytes; a device expects only CONNACK and PUBACK`);
      if (type === 4) acks++;
      else if (type === 2) this.onConnack(buf[at + 3]);
      else throw new Error(`the broker sent a packet of type ${type}; a device expects only CONNACK and PUBACK`);
      at += 4;
    }
    if (at < buf.length) this.rest = buf.subarray(at);
    return acks;
  }
}

class ControllerConnection {
  private socket: net.Socket | null = null;
  private readonly topic: Buffer;
  /** Each sample's JSON up to its timestamp, written once: `{"serial":"…","ts":` (with a comma after the first). */
  private readonly sampleHeads: string[];
  private seq = 0;
  private ts: number;
  private nextId = 1;
  /** Messages this connection may still send before it waits for PUBACKs. */
  credit: number;
  /** Messages sent and not yet acknowledged. */
  get unacknowledged() {
    return this.window - this.credit;
  }

  constructor(
    private readonly t: PublisherTarget,
    private readonly clientId: string,
    startTs: number,
    private readonly window: number,
  ) {
    this.topic = Buffer.from(topics.raw(t.controllerId));
    this.sampleHeads = t.serials.map((serial, i) => `${i ? "," : ""}{"serial":${JSON.stringify(serial)},"ts":`);
    this.ts = startTs;
    this.credit = window;
  }

  connect(url: URL, onAcks: (conn: ControllerConnection, n: number) => void): Promise<void> {
    return new Promise((resolve, reject) => {
      const socket = net.connect({ host: url.hostname, port: Number(url.port), noDelay: true });
      const reader = new AckReader((returnCode) => {
        if (returnCode === 0) resolve();
        else reject(new Error(`the broker refused ${this.t.controllerId} (return code ${returnCode})`));
      });
      socket.on("data", (chunk: Buffer) => {
        const acks = reader.read(chunk);
        if (acks) onAcks(this, acks);
      });
      socket.once("error", reject);
      socket.write(
        mqttPacket.generate({
          cmd: "connect",
          protocolId: "MQTT",
          protocolVersion: 4,
          clean: true,
          clientId: this.clientId,
          keepalive: 60,
          username: this.t.username,
          password: Buffer.from(this.t.password),
        }),
      );
      this.socket = socket;
    });
  }

  get samplesPerMessage() {
    return this.t.serials.length;
  }

  /** Sends up to `n` messages in one write; returns the number of samples sent. */
  send(n: number): number {
    if (!this.socket || n <= 0) return 0;
    const packets: Buffer[] = [];
    for (let k = 0; k < n; k++) {
      const ts = ++this.ts;
      let samples = "";
      for (let i = 0; i < this.sampleHeads.length; i++) {
        const signal = i === 2 ? 20.5 : 40 + (ts % 7);
        samples += `${this.sampleHeads[i]}${ts},"signal":${signal}}`;
      }
      packets.push(publishPacket(this.topic, this.nextId, `{"v":1,"seq":${this.seq++},"samples":[${samples}]}`));
      this.nextId = this.nextId === 65535 ? 1 : this.nextId + 1;
    }
    this.credit -= n;
    this.socket.write(packets.length === 1 ? packets[0] : Buffer.concat(packets));
    return n * this.t.serials.length;
  }

  close(): Promise<void> {
    const socket = this.socket;
    if (!socket) return Promise.resolve();
    return new Promise((resolve) => {
      socket.once("close", () => resolve());
      socket.end(mqttPacket.generate({ cmd: "disconnect" }));
      setTimeout(() => socket.destroy(), 1000).unref();
    });
  }
}

export class LoadPublisher {
  private stream: MqttClient | null = null;
  private connections: ControllerConnection[] = [];
  private running = false;
  /** Open loop: messages each connection still has to send, and a wake-up when all are acknowledged. */
  private backlogLeft = new Map<ControllerConnection, number>();
  private backlogDone: (() => void) | null = null;
  /** Connections holding credit while the chain catches up. */
  private parked = new Set<ControllerConnection>();
  published = 0;
  streamed = 0;

  constructor(
    private readonly url: string,
    private readonly targets: PublisherTarget[],
    private readonly opts = { windowPerConnection: 100, maxOutstanding: 30_000, startTs: Date.now() - 120_000 },
  ) {}

  private spend(conn: ControllerConnection) {
    const left = this.backlogLeft.get(conn);
    if (left !== undefined) {
      const sent = conn.send(Math.min(left, conn.credit));
      this.backlogLeft.set(conn, left - sent / conn.samplesPerMessage);
      if (this.backlogDone && this.connections.every((c) => this.backlogLeft.get(c) === 0 && c.unacknowledged === 0)) this.backlogDone();
      return;
    }
    if (!this.running) return;
    if (this.published - this.streamed > this.opts.maxOutstanding) {
      this.parked.add(conn); // resumes when the stream shows commits
      return;
    }
    this.published += conn.send(conn.credit);
  }

  async start(): Promise<void> {
    this.running = true;
    const stream = mqtt.connect(this.url, {
      username: SERVICE_ACCOUNTS.web.username,
      password: SERVICE_ACCOUNTS.web.password(),
      clientId: serviceClientId("web", `bench-${process.pid}`),
      clean: true,
      reconnectPeriod: 0,
    });
    this.stream = stream;
    await new Promise<void>((resolve, reject) => {
      stream.once("connect", () => resolve());
      stream.once("error", reject);
    });
    stream.on("message", (_topic, payload) => {
      this.streamed += countReadings(payload);
      const parked = [...this.parked];
      this.parked.clear();
      for (const conn of parked) this.spend(conn);
    });
    await stream.subscribeAsync(topics.readingWildcard, { qos: 0 });

    const url = new URL(this.url);
    this.connections = this.targets.map(
      (t, i) => new ControllerConnection(t, deviceClientId(t.controllerId, `bench-${process.pid}-${i}`), this.opts.startTs, this.opts.windowPerConnection),
    );
    await Promise.all(
      this.connections.map((conn) =>
        conn.connect(url, (c, n) => {
          c.credit += n;
          this.spend(c);
        }),
      ),
    );
    for (const conn of this.connections) this.spend(conn);
  }

  /** Stops the closed loop; resolves once the broker has acknowledged everything sent. */
  async pause(): Promise<void> {
    this.running = false;
    this.parked.clear();
    while (this.connections.some((c) => c.unacknowledged > 0)) await new Promise((r) => setTimeout(r, 20));
  }

  /**
   * Publishes `messagesPerConnection` more messages on every connection without waiting for
   * commits (after `pause()`); resolves with the samples sent once the broker acknowledged them all.
   */
  async backlog(messagesPerConnection: number): Promise<number> {
    const done = new Promise<void>((resolve) => (this.backlogDone = resolve));
    for (const conn of this.connections) this.backlogLeft.set(conn, messagesPerConnection);
    for (const conn of this.connections) this.spend(conn);
    await done;
    this.backlogDone = null;
    this.backlogLeft.clear();
    return this.connections.reduce((n, c) => n + messagesPerConnection * c.samplesPerMessage, 0);
  }

  async stop(): Promise<void> {
    this.running = false;
    await Promise.all(this.connections.map((c) => c.close()));
    await new Promise<void>((resolve) => (this.stream ? this.stream.end(false, {}, () => resolve()) : resolve()));
  }
}
