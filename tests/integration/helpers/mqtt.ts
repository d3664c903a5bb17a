// MQTT clients for tests: connect and wait for the CONNACK (or the refusal).
import mqtt, { type IClientOptions, type MqttClient } from "mqtt";
import { SERVICE_ACCOUNTS, serviceClientId, type ServiceAccount } from "../../../ingest/topics";

/** Connects (no automatic reconnect); resolves once connected, rejects with the refusal. */
export function connectMqtt(url: string, opts: IClientOptions): Promise<MqttClient> {
  return new Promise((resolve, reject) => {
    const client = mqtt.connect(url, { reconnectPeriod: 0, connectTimeout: 5000, ...opts });
    client.once("connect", () => resolve(client));
    client.once("error", (err) => {
      client.end(true);
      reject(err);
    });
  });
}

export function serviceLogin(account: ServiceAccount, clientSuffix: string): IClientOptions {
  return {
    username: SERVICE_ACCOUNTS[account].username,
    password: SERVICE_ACCOUNTS[account].password(),
    clientId: serviceClientId(account, `test-${clientSuffix}-${process.pid}`),
  };
}

export const endMqtt = (client: MqttClient) => new Promise<void>((resolve) => client.end(false, {}, () => resolve()));
