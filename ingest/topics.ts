// Tidewell's MQTT topic scheme, version 1. Documented in the README ("Topics and payloads").
//   tw/v1/dev/{controllerId}/raw           device → ingest   raw signals (QoS 1)
//   tw/v1/dev/{controllerId}/cmd/dosing    web/ingest → device   dosing inhibit, retained
//   tw/v1/org/{orgId}/tank/{tankId}/reading ingest → web     calibrated readings for the live stream
//   tw/v1/org/{orgId}/event                ingest/web → web  incidents, holds, calibrations
//   tw/v1/sim/{controllerId}/control       web/tests → simulator   faults and buffer placement
//
// Who may do what on the embedded broker is in ingest/broker/acl.ts.

export const TOPIC_ROOT = "tw/v1";

export const topics = {
  raw: (controllerId: string) => `${TOPIC_ROOT}/dev/${controllerId}/raw`,
  rawWildcard: `${TOPIC_ROOT}/dev/+/raw`,
  /** The raw topics as an MQTT 5 shared subscription: each message goes to one worker of the group. */
  sharedRaw: (group: string) => `$share/${group}/${TOPIC_ROOT}/dev/+/raw`,
  dosingCommand: (controllerId: string) => `${TOPIC_ROOT}/dev/${controllerId}/cmd/dosing`,
  /** Every command topic of one controller (what a device subscribes to). */
  commandWildcard: (controllerId: string) => `${TOPIC_ROOT}/dev/${controllerId}/cmd/#`,
  /** Every command topic of every controller (what web and ingest may publish to). */
  commandAll: `${TOPIC_ROOT}/dev/+/cmd/#`,
  reading: (orgId: number, tankId: number) => `${TOPIC_ROOT}/org/${orgId}/tank/${tankId}/reading`,
  readingWildcard: `${TOPIC_ROOT}/org/+/tank/+/reading`,
  event: (orgId: number) => `${TOPIC_ROOT}/org/${orgId}/event`,
  eventWildcard: `${TOPIC_ROOT}/org/+/event`,
  /** Everything under the organisations (what the web subscribes to). */
  orgAll: `${TOPIC_ROOT}/org/#`,
  simControl: (controllerId: string) => `${TOPIC_ROOT}/sim/${controllerId}/control`,
  simControlWildcard: `${TOPIC_ROOT}/sim/+/control`,
} as const;

/** The controller id in a device topic, or null when the topic is not a device topic. */
export function controllerOfTopic(topic: string): string | null {
  const m = /^tw\/v1\/dev\/([^/]+)\//.exec(topic);
  return m ? m[1] : null;
}

/** The controller id in a raw topic (`tw/v1/dev/{id}/raw`), or null. */
export function controllerOfRawTopic(topic: string): string | null {
  const m = /^tw\/v1\/dev\/([^/+#]+)\/raw$/.exec(topic);
  return m ? m[1] : null;
}

/** The controller id in a sim control topic, or null. */
export function controllerOfSimControlTopic(topic: string): string | null {
  const m = /^tw\/v1\/sim\/([^/+#]+)\/control$/.exec(topic);
  return m ? m[1] : null;
}

/**
 * Controller ids become topic levels, so they must not contain `/`, `+`, `#` or spaces.
 * The `tidewell-` prefix is kept for service client ids (see SERVICE_CLIENT_ID_PREFIX).
 */
export const CONTROLLER_ID_PATTERN = /^(?!tidewell-)[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/;

/**
 * Client ids starting with this prefix belong to the service accounts; the broker refuses a
 * device that tries one, so a device cannot take over (and so disconnect) the ingest's session.
 * A device's client id must be its controller id, or start with `{controllerId}-`.
 */
export const SERVICE_CLIENT_ID_PREFIX = "tidewell-";

/** The ingest's fixed client id: its persistent session (clean: false) queues QoS 1 raw messages. */
export function ingestClientId(): string {
  return process.env.MQTT_INGEST_CLIENT_ID ?? "tidewell-ingest";
}

/** Service accounts on the broker (devices authenticate with their own issued credentials). */
export const SERVICE_ACCOUNTS = {
  ingest: { username: "svc-ingest", password: () => process.env.MQTT_INGEST_PASSWORD ?? "tidewell-ingest-local" },
  web: { username: "svc-web", password: () => process.env.MQTT_WEB_PASSWORD ?? "tidewell-web-local" },
  simulator: { username: "svc-simulator", password: () => process.env.MQTT_SIMULATOR_PASSWORD ?? "tidewell-simulator-local" },
} as const;
export type ServiceAccount = keyof typeof SERVICE_ACCOUNTS;

export function mqttUrl(): string {
  return process.env.MQTT_URL ?? `mqtt://127.0.0.1:${process.env.BROKER_PORT ?? 1883}`;
}
