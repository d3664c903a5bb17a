// The ingest's broker connection: a persistent session (fixed client id, clean: false) with
// QoS 1 raw subscriptions whose PUBACKs are sent by us, after the rows are committed. Several
// workers can share the raw subscription (MQTT 5 `$share/{group}/…`, each its own session).
//
// mqtt.js acknowledges a QoS 1 message as soon as `handleMessage` calls back, and it does not
// read the next packet until then; `customHandleAcks` only exists for MQTT 5, which aedes does
// not speak. So we call back at once (keeping the stream flowing), suppress that automatic
// PUBACK, and send our own when the batch holding the message has committed. A PUBACK is sent
// only on the connection that delivered the message: after a reconnect the broker redelivers
// whatever was not acknowledged, and the database ignores the duplicates.
import mqtt, { type IClientOptions, type IPublishPacket, type MqttClient, type Packet } from "mqtt";
import type { Logger } from "../log";
import { errorText } from "../log";

type SendPacket = (packet: Packet, cb?: (err?: Error) => void, cbStorePut?: () => void, noStore?: boolean) => void;

/**
 * Names one received QoS 1 message for `ackAll`: its packet id and the connection it came on,
 * as one number (a batch holds thousands of these until it commits: numbers, not closures).
 */
export type AckToken = number;

const IDS_PER_CONNECTION = 65_536; // MQTT packet ids are 16 bits

export interface RawHandler {
  /**
   * A raw message; `ack` (null for QoS 0) is what `ackAll` sends its PUBACK for. Return a
   * promise to pause reading from the broker until it settles (backpressure), or nothing to
   * keep reading.
   */
  (topic: string, payload: Buffer, ack: AckToken | null): Promise<void> | void;
}

export interface IngestSessionOptions {
  url: string;
  clientId: string;
  username: string;
  password: string;
  /** Subscribed with QoS 1 and manual acknowledgement. */
  rawFilter: string;
  isRawTopic: (topic: string) => boolean;
  /** Subscribed with QoS 0; delivered to onOther. */
  otherFilters: string[];
  onRaw: RawHandler;
  onOther: (topic: string, payload: Buffer) => void;
  onConnect?: (sessionPresent: boolean) => void;
  /**
   * MQTT 5 (for a shared subscription): the session outlives a disconnect by this long, so the
   * broker keeps this worker's unacknowledged and queued messages for it until it is back.
   */
  mqtt5SessionExpirySeconds?: number;
  log: Logger;
}

export interface IngestSession {
  client: MqttClient;
  /**
   * Sends the PUBACKs of these messages, in one write. Those received on an earlier connection
   * are skipped: the broker redelivers them, and the database ignores the duplicates.
   */
  ackAll(acks: readonly AckToken[]): void;
  publish(topic: string, payload: string | Buffer, qos?: 0 | 1, retain?: boolean): void;
  /** Stops new raw messages coming (the broker gives them to the rest of a shared group). */
  unsubscribeRaw(): Promise<void>;
  /** Disconnects; `endSession` (MQTT 5) also ends the persistent session at the broker. */
  close(endSession?: boolean): Promise<void>;
}

export function openIngestSession(o: IngestSessionOptions): IngestSession {
  const options: IClientOptions = {
    clientId: o.clientId,
    clean: false,
    username: o.username,
    password: o.password,
    reconnectPeriod: 1000,
    connectTimeout: 10_000,
    keepalive: 30,
    resubscribe: false, // we subscribe on every connect ourselves
    // mqtt.js traces every packet through `debug` even when tracing is off, a visible share of
    // the ingest's CPU per message; DEBUG=mqttjs* still turns the trace on.
    ...(process.env.DEBUG?.includes("mqttjs") ? {} : { log: () => undefined }),
    ...(o.mqtt5SessionExpirySeconds ? { protocolVersion: 5 as const, properties: { sessionExpiryInterval: o.mqtt5SessionExpirySeconds } } : {}),
  };
  const client = mqtt.connect(o.url, options);
  const internal = client as unknown as { _sendPacket?: SendPacket };
  const original = internal._sendPacket;
  if (typeof original !== "function") throw new Error("mqtt.js internals changed: _sendPacket is missing; manual acknowledgement cannot work");
  const sendPacket: SendPacket = original.bind(client);

  let generation = 0; // bumped on every (re)connect: acks are only valid on their own connection

  // Every automatic PUBACK is swallowed: the only QoS 1 subscription is the raw one, and its
  // acknowledgements go out through `sendPacket` directly, after commit.
  internal._sendPacket = (packet, cb, cbStorePut, noStore) => {
    if (packet.cmd === "puback") {
      cb?.();
      return;
    }
    sendPacket(packet, cb, cbStorePut, noStore);
  };

  client.handleMessage = (packet: IPublishPacket, callback) => {
    const payload = Buffer.isBuffer(packet.payload) ? packet.payload : Buffer.from(packet.payload);
    if (!o.isRawTopic(packet.topic)) {
      try {
        o.onOther(packet.topic, payload);
      } finally {
        callback();
      }
      return;
    }
    const ack = packet.qos > 0 && packet.messageId !== undefined ? generation * IDS_PER_CONNECTION + packet.messageId : null;
    const pause = o.onRaw(packet.topic, payload, ack);
    if (pause) pause.then(() => callback(), () => callback());
    else callback();
  };

  client.on("connect", (connack) => {
    generation++;
    const sessionPresent = connack.sessionPresent;
    const subs: Record<string, { qos: 0 | 1 }> = { [o.rawFilter]: { qos: 1 } };
    for (const f of o.otherFilters) subs[f] = { qos: 0 };
    client.subscribe(subs, (err) => {
      if (err) {
        o.log.error("subscribe failed", err);
        return;
      }
      o.log.info(`subscribed ${Object.keys(subs).join(", ")} as ${o.clientId} (session present: ${sessionPresent ? "yes" : "no"})`);
    });
    o.onConnect?.(sessionPresent);
  });
  client.on("close", () => {
    generation++;
  });
  client.on("reconnect", () => o.log.info("reconnecting to the broker"));
  client.on("error", (err) => o.log.warn(`broker connection: ${errorText(err)}`));

  return {
    client,
    ackAll(acks) {
      if (!client.connected) return; // the broker will redeliver them all
      const current = generation * IDS_PER_CONNECTION;
      const send = () => {
        for (const ack of acks) {
          const messageId = ack - current;
          if (messageId >= 0 && messageId < IDS_PER_CONNECTION) sendPacket({ cmd: "puback", messageId }, undefined, undefined, true);
        }
      };
      const stream = client.stream as Partial<Pick<import("node:net").Socket, "cork" | "uncork">> | undefined;
      if (!stream?.cork || !stream.uncork) return send();
      stream.cork();
      try {
        send();
      } finally {
        process.nextTick(() => stream.uncork?.());
      }
    },
    publish(topic, payload, qos = 0, retain = false) {
      if (!client.connected) return; // live readings are best effort; the database is the record
      client.publish(topic, payload, { qos, retain });
    },
    unsubscribeRaw: async () => {
      if (client.connected) await client.unsubscribeAsync(o.rawFilter);
    },
    close: (endSession = false) =>
      new Promise<void>((resolve) => client.end(false, endSession && o.mqtt5SessionExpirySeconds ? { properties: { sessionExpiryInterval: 0 } } : {}, () => resolve())),
  };
}
