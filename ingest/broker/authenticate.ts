// Who may connect: the three service accounts (passwords from the environment) and devices
// with their issued credentials (DeviceDirectory). Client ids are checked too, so nobody can
// take over another principal's session by reusing its client id.
import { createHash, timingSafeEqual } from "node:crypto";
import { SERVICE_ACCOUNTS, SERVICE_CLIENT_ID_PREFIX, type ServiceAccount } from "../topics";
import type { DeviceDirectory } from "./device-directory";
import type { Principal } from "./principals";

export type AuthResult = { ok: true; principal: Principal } | { ok: false; reason: string };

function sameSecret(a: string, b: string): boolean {
  // Compare digests so the comparison takes the same time whatever the lengths.
  const da = createHash("sha256").update(a).digest();
  const db = createHash("sha256").update(b).digest();
  return timingSafeEqual(da, db);
}

function serviceAccountOf(username: string): ServiceAccount | null {
  for (const [account, spec] of Object.entries(SERVICE_ACCOUNTS) as [ServiceAccount, (typeof SERVICE_ACCOUNTS)[ServiceAccount]][]) {
    if (spec.username === username) return account;
  }
  return null;
}

/** A device's client id is its controller id, or starts with `{controllerId}-`. */
export function deviceClientIdAllowed(clientId: string, controllerId: string): boolean {
  return clientId === controllerId || clientId.startsWith(`${controllerId}-`);
}

export async function authenticate(
  directory: DeviceDirectory,
  clientId: string,
  username: string | undefined,
  password: Buffer | undefined,
): Promise<AuthResult> {
  if (!username || !password) return { ok: false, reason: "no credentials" };
  const secret = password.toString("utf8");
  const account = serviceAccountOf(username);
  if (account) {
    if (!sameSecret(secret, SERVICE_ACCOUNTS[account].password())) return { ok: false, reason: "wrong password for service account" };
    if (!clientId.startsWith(SERVICE_CLIENT_ID_PREFIX)) return { ok: false, reason: `service client ids must start with "${SERVICE_CLIENT_ID_PREFIX}"` };
    return { ok: true, principal: { kind: "service", account, username } };
  }
  const verified = await directory.verify(username, secret);
  if (!verified.ok) return { ok: false, reason: verified.reason };
  const { device } = verified;
  if (!deviceClientIdAllowed(clientId, device.controllerId)) {
    return { ok: false, reason: `client id must be "${device.controllerId}" or start with "${device.controllerId}-"` };
  }
  return { ok: true, principal: { kind: "device", username: device.username, controllerId: device.controllerId, deviceId: device.deviceId } };
}
