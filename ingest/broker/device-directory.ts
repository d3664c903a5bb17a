// Device credentials from the database: username + bcrypt check of devices.secret_hash,
// refused once revoked_at is set. Verified credentials are cached briefly so reconnecting
// devices do not cost a bcrypt each time; the watcher re-reads the cached and connected
// devices every few seconds so a revocation (or a rotated secret) takes effect promptly.
import { createHash } from "node:crypto";
import bcrypt from "bcryptjs";
import type { Client as DbClient } from "@libsql/client";
import { z } from "zod";
import { CONTROLLER_ID_PATTERN } from "../topics";

const deviceRow = z.object({
  id: z.coerce.number().int(),
  username: z.string(),
  controller_id: z.string(),
  secret_hash: z.string(),
  revoked_at: z.coerce.number().int().nullable(),
});
type DeviceRow = z.infer<typeof deviceRow>;

export interface VerifiedDevice {
  deviceId: number;
  username: string;
  controllerId: string;
}

export type Verification =
  | { ok: true; device: VerifiedDevice }
  | { ok: false; reason: "unknown-username" | "wrong-password" | "revoked" | "bad-controller-id" };

interface CacheEntry {
  device: VerifiedDevice;
  secretHash: string;
  passwordDigest: string;
  verifiedAt: number;
}

const digest = (password: string) => createHash("sha256").update(password).digest("hex");

export class DeviceDirectory {
  private cache = new Map<string, CacheEntry>();
  private timer: NodeJS.Timeout | null = null;

  constructor(
    private readonly db: DbClient,
    private readonly opts: { cacheTtlMs: number; recheckMs: number },
  ) {}

  /** The device, when these credentials were verified within the cache's lifetime (no hashing). */
  verifiedFromCache(username: string, password: string, now = Date.now()): VerifiedDevice | null {
    const cached = this.cache.get(username);
    if (cached && cached.passwordDigest === digest(password) && now - cached.verifiedAt < this.opts.cacheTtlMs) return cached.device;
    return null;
  }

  async verify(username: string, password: string, now = Date.now()): Promise<Verification> {
    const fromCache = this.verifiedFromCache(username, password, now);
    if (fromCache) return { ok: true, device: fromCache };
    const pwDigest = digest(password);
    const row = await this.lookup(username);
    if (!row) return { ok: false, reason: "unknown-username" };
    if (row.revoked_at !== null) return { ok: false, reason: "revoked" };
    if (!CONTROLLER_ID_PATTERN.test(row.controller_id)) return { ok: false, reason: "bad-controller-id" };
    if (!(await bcrypt.compare(password, row.secret_hash))) return { ok: false, reason: "wrong-password" };
    const device = { deviceId: row.id, username: row.username, controllerId: row.controller_id };
    this.cache.set(username, { device, secretHash: row.secret_hash, passwordDigest: pwDigest, verifiedAt: now });
    return { ok: true, device };
  }

  /**
   * Every `recheckMs`, re-reads the cached devices and the connected ones; calls `onInvalid`
   * for each that was revoked, deleted or given a new secret, after dropping it from the cache.
   */
  watch(connectedUsernames: () => Iterable<string>, onInvalid: (username: string, why: string) => void): void {
    const tick = async () => {
      const names = new Set([...this.cache.keys(), ...connectedUsernames()]);
      if (names.size === 0) return;
      const list = [...names];
      const found = new Map<string, DeviceRow>();
      for (let i = 0; i < list.length; i += 500) {
        const chunk = list.slice(i, i + 500);
        const rs = await this.db.execute({
          sql: `SELECT id, username, controller_id, secret_hash, revoked_at FROM devices WHERE username IN (${chunk.map(() => "?").join(",")})`,
          args: chunk,
        });
        for (const r of rs.rows) {
          const row = deviceRow.parse(r);
          found.set(row.username, row);
        }
      }
      for (const name of list) {
        const row = found.get(name);
        const cached = this.cache.get(name);
        const why = !row ? "device deleted" : row.revoked_at !== null ? "device revoked" : cached && cached.secretHash !== row.secret_hash ? "secret rotated" : null;
        if (why) {
          this.cache.delete(name);
          onInvalid(name, why);
        }
      }
    };
    let running = false;
    this.timer = setInterval(() => {
      if (running) return;
      running = true;
      tick()
        .catch((err: unknown) => console.error(`[broker] device re-check failed: ${err instanceof Error ? err.message : String(err)}`))
        .finally(() => (running = false));
    }, this.opts.recheckMs);
    this.timer.unref();
  }

  stop(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  private async lookup(username: string): Promise<DeviceRow | null> {
    const rs = await this.db.execute({
      sql: "SELECT id, username, controller_id, secret_hash, revoked_at FROM devices WHERE username = ?",
      args: [username],
    });
    return rs.rows.length ? deviceRow.parse(rs.rows[0]) : null;
  }
}
