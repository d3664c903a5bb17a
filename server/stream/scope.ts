// Which tanks and probes a live stream may carry: the user's organisation, narrowed to one site or tank.
import { and, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { probes, sites, tanks, type ProbeKind } from "@/db/schema";

export interface StreamScope {
  orgId: number;
  /** Tanks in scope, or null for every tank of the organisation (including ones added later). */
  tankIds: Set<number> | null;
  probes: Map<number, { tankId: number; kind: ProbeKind }>;
}

export async function streamScope(db: Db, orgId: number, filter: { site?: number; tank?: number }): Promise<StreamScope | null> {
  const rows = await db
    .select({ tankId: tanks.id, probeId: probes.id, kind: probes.kind })
    .from(tanks)
    .innerJoin(sites, eq(sites.id, tanks.siteId))
    .leftJoin(probes, eq(probes.tankId, tanks.id))
    .where(and(eq(sites.orgId, orgId), filter.site ? eq(tanks.siteId, filter.site) : undefined, filter.tank ? eq(tanks.id, filter.tank) : undefined));
  const narrowed = filter.site !== undefined || filter.tank !== undefined;
  if (narrowed && rows.length === 0) return null;
  const probeMap = new Map<number, { tankId: number; kind: ProbeKind }>();
  for (const r of rows) if (r.probeId !== null && r.kind !== null) probeMap.set(r.probeId, { tankId: r.tankId, kind: r.kind });
  return { orgId, tankIds: narrowed ? new Set(rows.map((r) => r.tankId)) : null, probes: probeMap };
}

export function tankInScope(scope: StreamScope, tankId: number | null): boolean {
  if (scope.tankIds === null) return true;
  return tankId !== null && scope.tankIds.has(tankId);
}
