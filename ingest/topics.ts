// Tidewell's MQTT topic scheme, version 1. Documented in the README ("Topics and payloads").
//   tw/v1/dev/{controllerId}/raw           device → ingest   raw signals (QoS 1)
//   tw/v1/dev/{controllerId}/cmd/dosing    web/ingest → device   dosing inhibit, retained
//   tw/v1/org/{orgId}/tank/{tankId}/reading ingest → web     calibrated readings for the live stream
//   tw/v1/org/{orgId}/event                ingest/web → web  incidents, holds, calibrations
//   tw/v1/sim/{controllerId}/control       web/tests → simulator   faults and buffer placement
//
// Who may do what on the embedded broker is in ingest/broker/acl.ts.

import { requireSecret } from "./secrets";

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
 * device that tries one, so a device cannot take over (and so disconnect) a service's session.
 * Each account has its own prefix within it: `tidewell-{account}` or `tidewell-{account}-…`.
 */
export const SERVICE_CLIENT_ID_PREFIX = "tidewell-";

/** A client id of a service account: `tidewell-{account}`, or `tidewell-{account}-{suffix}`. */
export function serviceClientId(account: ServiceAccount, suffix?: string): string {
  return suffix ? `${SERVICE_CLIENT_ID_PREFIX}${account}-${suffix}` : `${SERVICE_CLIENT_ID_PREFIX}${account}`;
}

export function serviceClientIdAllowed(account: ServiceAccount, clientId: string): boolean {
  const own = serviceClientId(account);
  return clientId === own || clientId.startsWith(`${own}-`);
}

/**
 * A device's client id is its controller id, or `{controllerId}:{session}` when it keeps more
 * than one connection. `:` cannot occur in a controller id, so the controller a client id belongs
 * to is unambiguous: no device can take a client id that is, or starts like, another's.
 */
export const DEVICE_CLIENT_ID_SEPARATOR = ":";
const DEVICE_SESSION_PATTERN = /^[A-Za-z0-9._-]{1,64}$/;

export function deviceClientId(controllerId: string, session?: string): string {
  return session ? `${controllerId}${DEVICE_CLIENT_ID_SEPARATOR}${session}` : controllerId;
}

export function deviceClientIdAllowed(clientId: string, controllerId: string): boolean {
  if (clientId === controllerId) return true;
  const prefix = `${controllerId}${DEVICE_CLIENT_ID_SEPARATOR}`;
  return clientId.startsWith(prefix) && DEVICE_SESSION_PATTERN.test(clientId.slice(prefix.length));
}

/** The ingest's client id: its persistent session (clean: false) queues QoS 1 raw messages. */
export function ingestClientId(): string {
  return process.env.MQTT_INGEST_CLIENT_ID ?? serviceClientId("ingest");
}

/**
 * Service accounts on the broker (devices authenticate with their own issued credentials). The
 * passwords are generated per installation and read from the environment (ingest/secrets.ts).
 */
export const SERVICE_ACCOUNTS = {
  ingest: { username: "svc-ingest", password: () => requireSecret("MQTT_INGEST_PASSWORD") },
  web: { username: "svc-web", password: () => requireSecret("MQTT_WEB_PASSWORD") },
  simulator: { username: "svc-simulator", password: () => requireSecret("MQTT_SIMULATOR_PASSWORD") },
} as const;
export type ServiceAccount = keyof typeof SERVICE_ACCOUNTS;

export function mqttUrl(): string {
  return process.env.MQTT_URL ?? `mqtt://127.0.0.1:${process.env.BROKER_PORT ?? 1883}`;
}
