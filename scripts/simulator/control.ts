// The simulator's control channel: as svc-simulator it subscribes tw/v1/sim/+/control and
// hands each valid simControl message to the tanks of that controller.
import mqtt, { type MqttClient } from "mqtt";
import { simControl, type SimControl } from "../../ingest/payloads";
import { controllerOfSimControlTopic, SERVICE_ACCOUNTS, topics } from "../../ingest/topics";

/** `subscribed` resolves once the broker has confirmed the control subscription. */
export function listenForControl(
  url: string,
  onControl: (controllerId: string, msg: SimControl) => void,
  log: (line: string) => void,
): { client: MqttClient; subscribed: Promise<void> } {
  let markSubscribed: () => void = () => undefined;
  const subscribed = new Promise<void>((resolve) => (markSubscribed = resolve));
  const client = mqtt.connect(url, {
    username: SERVICE_ACCOUNTS.simulator.username,
    password: SERVICE_ACCOUNTS.simulator.password(),
    clientId: `tidewell-simulator-${process.pid}`,
    clean: true,
    reconnectPeriod: 500,
  });
  client.on("connect", () =>
    client.subscribe(topics.simControlWildcard, { qos: 1 }, (err) => {
      if (err) log(`control subscription refused: ${err.message}`);
      else markSubscribed();
    }),
  );
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
  return { client, subscribed };
}
