// What the alert runner and the web need from an MQTT connection: publish one message.
// Matches mqtt.js `publishAsync`, so a connected client can be passed straight in.
export interface PublishOptions {
  qos: 0 | 1;
  retain: boolean;
}

export type Publish = (topic: string, payload: string, opts: PublishOptions) => Promise<unknown>;
