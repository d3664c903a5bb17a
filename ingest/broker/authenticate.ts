// Who may connect: the three service accounts (passwords from the environment) and devices
// with their issued credentials (DeviceDirectory). Client ids are checked too, so nobody can
// take over another principal's session by reusing its client id: each service account has its
// own client-id prefix, and a device's client id names exactly its own controller.
// Wrong device passwords (each costs a bcrypt hash) are throttled per source address and per
// username; a device verified a moment ago is let through from the cache without a hash.
import { createHash, timingSafeEqual } from "node:crypto";
import { deviceClientId, deviceClientIdAllowed, SERVICE_ACCOUNTS, serviceClientId, serviceClientIdAllowed, type ServiceAccount } from "../topics";
import type { ConnectThrottle } from "./connect-throttle";
import type { DeviceDirectory } from "./device-directory";
import type { Principal } from "./principals";

export type AuthResult = { ok: true; principal: Principal } | { ok: false; reason: string; code: RefusalCode };

/** MQTT 3.1.1 CONNACK codes: 2 identifier rejected, 3 server unavailable (retry later), 4 bad credentials. */
export type RefusalCode = 2 | 3 | 4;

export interface ConnectAttempt {
  clientId: string;
  username: string | undefined;
  password: Buffer | undefined;
  /** The source address (without port), for the throttle. */
  address: string;
}

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

export interface ConnectThrottles {
  byAddress: ConnectThrottle;
  byUsername: ConnectThrottle;
}

export async function authenticate(directory: DeviceDirectory, throttles: ConnectThrottles, attempt: ConnectAttempt): Promise<AuthResult> {
  const { clientId, username, password } = attempt;
  if (!username || !password) return { ok: false, reason: "no credentials", code: 4 };
  const secret = password.toString("utf8");

  // Service passwords are 256 random bits compared by digest: nothing to throttle, nothing to guess.
  const account = serviceAccountOf(username);
  if (account) {
    if (!sameSecret(secret, SERVICE_ACCOUNTS[account].password())) return { ok: false, reason: "wrong password for service account", code: 4 };
    if (!serviceClientIdAllowed(account, clientId)) {
      return { ok: false, reason: `client id of ${username} must be "${serviceClientId(account)}" or start with "${serviceClientId(account)}-"`, code: 2 };
    }
    return { ok: true, principal: { kind: "service", account, username } };
  }

  // A device verified moments ago with this very secret: no hash and no throttle, so a flood of
  // wrong passwords for its username cannot lock the real device out.
  const cached = directory.verifiedFromCache(username, secret);
  if (cached) return deviceResult(cached, clientId);

  const { byAddress, byUsername } = throttles;
  const releaseAddress = await byAddress.turn(attempt.address);
  const releaseUsername = await byUsername.turn(username);
  try {
    // An earlier attempt in the queue may have verified these very credentials.
    const nowCached = directory.verifiedFromCache(username, secret);
    if (nowCached) return deviceResult(nowCached, clientId);
    const blocked = Math.max(byAddress.blockedFor(attempt.address), byUsername.blockedFor(username));
    if (blocked > 0) return { ok: false, reason: `too many failed connects; refused unchecked for ${Math.ceil(blocked / 1000)} s`, code: 3 };
    const verified = await directory.verify(username, secret);
    if (!verified.ok) {
      if (verified.reason === "unknown-username" || verified.reason === "wrong-password") {
        byAddress.failed(attempt.address);
        byUsername.failed(username);
      }
      return { ok: false, reason: verified.reason, code: 4 };
    }
    byUsername.succeeded(username);
    return deviceResult(verified.device, clientId);
  } finally {
    releaseUsername();
    releaseAddress();
  }
}

function deviceResult(device: { deviceId: number; username: string; controllerId: string }, clientId: string): AuthResult {
  if (!deviceClientIdAllowed(clientId, device.controllerId)) {
    return { ok: false, reason: `client id must be "${device.controllerId}" or "${deviceClientId(device.controllerId, "{session}")}"`, code: 2 };
  }
  return { ok: true, principal: { kind: "device", username: device.username, controllerId: device.controllerId, deviceId: device.deviceId } };
}
