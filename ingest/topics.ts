// Tidewell's MQTT topic scheme, version 1. Documented in the README ("Topics and payloads").
//   tw/v1/dev/{controllerId}/raw           device → ingest   raw signals (QoS 1)
//   tw/v1/dev/{controllerId}/cmd/dosing    web/ingest → device   dosing inhibit, retained
//   tw/v1/org/{orgId}/tank/{tankId}/reading ingest → web     calibrated readings for the live stream
//   tw/v1/org/{orgId}/event                ingest/web → web  incidents, holds, calibrations
//   tw/v1/sim/{controllerId}/control       web/tests → simulator   faults and buffer placement

export const TOPIC_ROOT = "tw/v1";

export const topics = {
  raw: (controllerId: string) => `${TOPIC_ROOT}/dev/${controllerId}/raw`,
  rawWildcard: `${TOPIC_ROOT}/dev/+/raw`,
  dosingCommand: (controllerId: string) => `${TOPIC_ROOT}/dev/${controllerId}/cmd/dosing`,
  reading: (orgId: number, tankId: number) => `${TOPIC_ROOT}/org/${orgId}/tank/${tankId}/reading`,
  readingWildcard: `${TOPIC_ROOT}/org/+/tank/+/reading`,
  event: (orgId: number) => `${TOPIC_ROOT}/org/${orgId}/event`,
  eventWildcard: `${TOPIC_ROOT}/org/+/event`,
  simControl: (controllerId: string) => `${TOPIC_ROOT}/sim/${controllerId}/control`,
  simControlWildcard: `${TOPIC_ROOT}/sim/+/control`,
} as const;

/** The controller id in a device topic, or null when the topic is not a device topic. */
export function controllerOfTopic(topic: string): string | null {
  const m = /^tw\/v1\/dev\/([^/]+)\//.exec(topic);
  return m ? m[1] : null;
}

/** Service accounts on the broker (devices authenticate with their own issued credentials). */
export const SERVICE_ACCOUNTS = {
  ingest: { username: "svc-ingest", password: () => process.env.MQTT_INGEST_PASSWORD ?? "tidewell-ingest-local" },
  web: { username: "svc-web", password: () => process.env.MQTT_WEB_PASSWORD ?? "tidewell-web-local" },
  simulator: { username: "svc-simulator", password: () => process.env.MQTT_SIMULATOR_PASSWORD ?? "tidewell-simulator-local" },
} as const;

export function mqttUrl(): string {
  return process.env.MQTT_URL ?? `mqtt://127.0.0.1:${process.env.BROKER_PORT ?? 1883}`;
}
