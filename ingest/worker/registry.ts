// Probes, tanks and controllers as the ingest needs them on the hot path, kept in memory and
// re-read periodically (and at most once a second on a miss, so a new probe is found quickly
// while a flood of unknown serials cannot turn into a flood of queries).
import type { Client as DbClient } from "@libsql/client";
import { z } from "zod";
import { PROBE_KINDS, PROBE_STATUSES } from "../../db/schema";

const probeRow = z.object({
  id: z.number().int(),
  serial: z.string(),
  kind: z.enum(PROBE_KINDS),
  tank_id: z.number().int(),
  status: z.enum(PROBE_STATUSES),
  retired_at: z.number().int().nullable(),
  nominal_cell_constant: z.number().nullable(),
});
const tankRow = z.object({
  id: z.number().int(),
  org_id: z.number().int(),
  site_id: z.number().int(),
  controller_id: z.string().nullable(),
  ec_alpha_per_c: z.number(),
  calibration_interval_days: z.number(),
  max_calibration_interval_days: z.number(),
});
const deviceRow = z.object({ controller_id: z.string(), tank_id: z.number().int() });

export interface ProbeInfo {
  id: number;
  serial: string;
  kind: (typeof PROBE_KINDS)[number];
  tankId: number;
  status: (typeof PROBE_STATUSES)[number];
  retiredAt: number | null;
  nominalCellConstant: number | null;
}

export interface TankInfo {
  id: number;
  orgId: number;
  siteId: number;
  alphaPerC: number;
  /** The tank's calibration interval, capped by its site's maximum. */
  intervalDays: number;
}

export interface RegistrySnapshot {
  probesBySerial: Map<string, ProbeInfo>;
  probesById: Map<number, ProbeInfo>;
  tanks: Map<number, TankInfo>;
  tankOfController: Map<string, number>;
}

export async function loadRegistry(db: DbClient): Promise<RegistrySnapshot> {
  const [probes, tanks, devices] = await Promise.all([
    db.execute("SELECT id, serial, kind, tank_id, status, retired_at, nominal_cell_constant FROM probes"),
    db.execute(
      `SELECT t.id, s.org_id, t.site_id, t.controller_id, t.ec_alpha_per_c, t.calibration_interval_days, s.max_calibration_interval_days
         FROM tanks t JOIN sites s ON s.id = t.site_id`,
    ),
    db.execute("SELECT controller_id, tank_id FROM devices WHERE revoked_at IS NULL AND tank_id IS NOT NULL"),
  ]);
  const snap: RegistrySnapshot = { probesBySerial: new Map(), probesById: new Map(), tanks: new Map(), tankOfController: new Map() };
  for (const r of probes.rows) {
    const p = probeRow.parse(r);
    const info: ProbeInfo = {
      id: p.id,
      serial: p.serial,
      kind: p.kind,
      tankId: p.tank_id,
      status: p.status,
      retiredAt: p.retired_at,
      nominalCellConstant: p.nominal_cell_constant,
    };
    snap.probesBySerial.set(info.serial, info);
    snap.probesById.set(info.id, info);
  }
  for (const r of tanks.rows) {
    const t = tankRow.parse(r);
    snap.tanks.set(t.id, {
      id: t.id,
      orgId: t.org_id,
      siteId: t.site_id,
      alphaPerC: t.ec_alpha_per_c,
      intervalDays: Math.min(t.calibration_interval_days, t.max_calibration_interval_days),
    });
    if (t.controller_id) snap.tankOfController.set(t.controller_id, t.id);
  }
  // A device row names the tank its controller serves; it wins over the tank's own column.
  for (const r of devices.rows) {
    const d = deviceRow.parse(r);
    snap.tankOfController.set(d.controller_id, d.tank_id);
  }
  return snap;
}

export class Registry {
  private lastMissRefresh = 0;
  private refreshing: Promise<void> | null = null;

  constructor(
    private readonly db: DbClient,
    public snap: RegistrySnapshot,
  ) {}

  static async open(db: DbClient): Promise<Registry> {
    return new Registry(db, await loadRegistry(db));
  }

  refresh(): Promise<void> {
    this.refreshing ??= loadRegistry(this.db)
      .then((snap) => {
        this.snap = snap;
      })
      .finally(() => (this.refreshing = null));
    return this.refreshing;
  }

  /** After a lookup miss: refresh in the background, at most once a second. */
  refreshAfterMiss(now = Date.now()): void {
    if (now - this.lastMissRefresh < 1000) return;
    this.lastMissRefresh = now;
    this.refresh().catch(() => undefined);
  }
}
