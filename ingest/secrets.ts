// The installation's secrets: the session/link signing key and the broker's service-account
// passwords. They come from the environment only; nothing in the source can stand in for them.
// `npm run demo` generates them once into data/secrets.json (scripts/demo-secrets.ts); tests
// generate fresh ones per run (generateSecrets).
import { randomBytes } from "node:crypto";

export const SECRET_VARIABLES = {
  AUTH_SECRET: { minLength: 32, meaning: "signs sessions, invitation and acknowledge links" },
  MQTT_INGEST_PASSWORD: { minLength: 16, meaning: "the broker password of the ingest (svc-ingest)" },
  MQTT_WEB_PASSWORD: { minLength: 16, meaning: "the broker password of the web app (svc-web)" },
  MQTT_SIMULATOR_PASSWORD: { minLength: 16, meaning: "the broker password of the simulator (svc-simulator)" },
} as const;
export type SecretName = keyof typeof SECRET_VARIABLES;
export const SECRET_NAMES = Object.keys(SECRET_VARIABLES) as SecretName[];

export class MissingSecret extends Error {
  constructor(readonly names: SecretName[]) {
    super(missingSecretMessage(names));
    this.name = "MissingSecret";
  }
}

function problem(name: SecretName, value: string | undefined): string | null {
  const { minLength, meaning } = SECRET_VARIABLES[name];
  if (!value) return `${name} is not set (${meaning})`;
  if (value.length < minLength) return `${name} is shorter than ${minLength} characters (${meaning})`;
  return null;
}

function missingSecretMessage(names: SecretName[]): string {
  const problems = names.map((n) => problem(n, process.env[n]) ?? `${n} is not usable`);
  return [
    ...problems,
    "Set each to a long random value, for example with `openssl rand -base64 32`;",
    "`npm run demo` generates them for you into data/secrets.json.",
  ].join("\n");
}

/** The secret's value; throws MissingSecret (with what to do) when it is unset or too short. */
export function requireSecret(name: SecretName): string {
  const value = process.env[name];
  if (problem(name, value)) throw new MissingSecret([name]);
  return value!;
}

/** The names among `names` that are unset or too short. */
export function missingSecrets(names: readonly SecretName[]): SecretName[] {
  return names.filter((n) => problem(n, process.env[n]) !== null);
}

/**
 * For a process's entry point: exits with a clear message when any of `names` is unusable,
 * before the process listens or connects anywhere.
 */
export function exitUnlessSecretsSet(processName: string, names: readonly SecretName[]): void {
  const missing = missingSecrets(names);
  if (missing.length === 0) return;
  console.error(`[${processName}] refusing to start:\n${new MissingSecret(missing).message}`);
  process.exit(1);
}

/** Fresh random values for every secret (256 bits each). */
export function generateSecrets(): Record<SecretName, string> {
  return Object.fromEntries(SECRET_NAMES.map((n) => [n, randomBytes(32).toString("base64url")])) as Record<SecretName, string>;
}
