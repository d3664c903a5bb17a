// The audit log: who changed what and when. Every settings change, hold, calibration and incident
// action writes one entry inside the same transaction as the change itself.
import { and, desc, eq, gte, like, lte } from "drizzle-orm";
import type { Db } from "../client";
import { auditLog, users } from "../schema";

/** A transaction handed to `db.transaction(async (tx) => …)`. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export interface AuditEntry {
  orgId: number;
  /** null when the system acted (a hold expiring, a device credential check). */
  userId: number | null;
  /** `<entity>.<verb>`, for example "tank.update", "device.revoke", "hold.place". */
  action: string;
  entity: string;
  entityId?: number | null;
  /** What changed, small and human-readable: `{ name: "L1", changed: { phMax: [6.5, 6.4] } }`. */
  detail?: Record<string, unknown> | null;
  at?: number;
}

export async function audit(tx: Tx | Db, entry: AuditEntry): Promise<void> {
  await tx.insert(auditLog).values({
    orgId: entry.orgId,
    userId: entry.userId,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId ?? null,
    detail: entry.detail ?? null,
    at: entry.at ?? Date.now(),
  });
}

/** Old and new value of every field that differs, for an update's audit detail. */
export function changedFields<T extends Record<string, unknown>>(before: T, after: Partial<T>): Record<string, [unknown, unknown]> {
  const out: Record<string, [unknown, unknown]> = {};
  for (const [k, v] of Object.entries(after)) if (v !== undefined && before[k] !== v) out[k] = [before[k], v];
  return out;
}

export interface AuditFilter {
  entity?: string;
  action?: string;
  user?: number;
  from?: number;
  to?: number;
  limit: number;
}

export async function listAudit(db: Db, orgId: number, f: AuditFilter) {
  return db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      action: auditLog.action,
      entity: auditLog.entity,
      entityId: auditLog.entityId,
      detail: auditLog.detail,
      userId: auditLog.userId,
      userName: users.name,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.userId))
    .where(
      and(
        eq(auditLog.orgId, orgId),
        f.entity ? eq(auditLog.entity, f.entity) : undefined,
        f.action ? like(auditLog.action, `${f.action}%`) : undefined,
        f.user ? eq(auditLog.userId, f.user) : undefined,
        f.from !== undefined ? gte(auditLog.at, f.from) : undefined,
        f.to !== undefined ? lte(auditLog.at, f.to) : undefined,
      ),
    )
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(f.limit);
}
export type AuditRow = Awaited<ReturnType<typeof listAudit>>[number];
