// The web server's MQTT publisher (svc-web): one lazily connected client per process. It never
// throws at import or connect time; `publish` rejects with a clear message when the broker
// cannot be reached, so a page can record its change and tell the user what did not go out.
import mqtt, { type MqttClient } from "mqtt";
import { SERVICE_ACCOUNTS, mqttUrl, serviceClientId } from "@/ingest/topics";
import type { Publish } from "@/ingest/alerts/publish";

const CONNECT_WAIT_MS = 3_000;
const PUBLISH_WAIT_MS = 5_000;

const globalForMqtt = globalThis as unknown as { __tidewellWebMqtt?: MqttClient };

function client(): MqttClient {
  if (globalForMqtt.__tidewellWebMqtt) return globalForMqtt.__tidewellWebMqtt;
  const c = mqtt.connect(mqttUrl(), {
    clientId: serviceClientId("web", `${process.pid}-${Math.random().toString(36).slice(2, 8)}`),
    username: SERVICE_ACCOUNTS.web.username,
    password: SERVICE_ACCOUNTS.web.password(),
    connectTimeout: CONNECT_WAIT_MS,
    reconnectPeriod: 5_000,
    // Nothing is queued while offline: the caller is told, and the ingest retries dosing commands.
    queueQoSZero: false,
  });
  c.on("error", (err) => console.error("[mqtt] web publisher:", err.message));
  globalForMqtt.__tidewellWebMqtt = c;
  return c;
}

export class BrokerUnavailable extends Error {}

function within<T>(ms: number, what: string, p: Promise<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new BrokerUnavailable(what)), ms);
    p.then(
      (v) => (clearTimeout(timer), resolve(v)),
      (err: unknown) => (clearTimeout(timer), reject(new BrokerUnavailable(`${what}: ${err instanceof Error ? err.message : String(err)}`))),
    );
  });
}

async function connected(c: MqttClient): Promise<void> {
  if (c.connected) return;
  await new Promise<void>((resolve, reject) => {
    const onConnect = () => {
      clearTimeout(timer);
      resolve();
    };
    const timer = setTimeout(() => {
      c.off("connect", onConnect);
      reject(new BrokerUnavailable(`the message broker at ${mqttUrl()} did not answer`));
    }, CONNECT_WAIT_MS);
    c.once("connect", onConnect);
  });
}

export const publish: Publish = async (topic, payload, opts) => {
  const c = client();
  await connected(c);
  await within(PUBLISH_WAIT_MS, "the message broker did not confirm the message", c.publishAsync(topic, payload, opts));
};
