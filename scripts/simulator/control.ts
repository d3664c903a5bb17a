// The simulator's control channel: as svc-simulator it subscribes tw/v1/sim/+/control and
// hands each valid simControl message to the tanks of that controller.
import mqtt, { type MqttClient } from "mqtt";
import { simControl, type SimControl } from "../../ingest/payloads";
import { controllerOfSimControlTopic, SERVICE_ACCOUNTS, topics } from "../../ingest/topics";

export function listenForControl(url: string, onControl: (controllerId: string, msg: SimControl) => void, log: (line: string) => void): MqttClient {
  const client = mqtt.connect(url, {
    username: SERVICE_ACCOUNTS.simulator.username,
    password: SERVICE_ACCOUNTS.simulator.password(),
    clientId: `tidewell-simulator-${process.pid}`,
    clean: true,
    reconnectPeriod: 500,
  });
  client.on("connect", () => client.subscribe(topics.simControlWildcard, { qos: 1 }));
  client.on("message", (topic, payload) => {
    const controllerId = controllerOfSimControlTopic(topic);
    if (!controllerId) return;
    let json: unknown;
    try {
      json = JSON.parse(payload.toString("utf8"));
    } catch {
      json = null;
    }
    const parsed = simControl.safeParse(json);
    if (!parsed.success) return log(`ignored an invalid control message for ${controllerId}`);
    onControl(controllerId, parsed.data);
  });
  client.on("error", (err) => log(`control channel: ${err.message}`));
  return client;
}
