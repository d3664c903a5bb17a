// What the simulator simulates: the seeded tanks with a controller, their active probes, the
// last accepted calibration of each probe (the electrode drifts from there), and the device
// credentials the seed wrote.
import fs from "node:fs";
import type { Client as DbClient } from "@libsql/client";
import { z } from "zod";

const credentialsFile = z.array(
  z.object({ controllerId: z.string(), username: z.string(), password: z.string(), tankId: z.number().int() }),
);
export type DeviceCredential = z.infer<typeof credentialsFile>[number];

export interface SimProbe {
  id: number;
  serial: string;
  installedAt: number;
  nominalCellConstant: number | null;
  /** Last accepted calibration (the electrode as it was then), if any. */
  calibration: { effectiveAt: number; slopePct: number | null; offsetMv: number | null; cellConstant: number | null } | null;
}

export interface SimTank {
  id: number;
  name: string;
  controllerId: string;
  band: { phMin: number; phMax: number; ecMinUs: number; ecMaxUs: number; tempMin: number; tempMax: number };
  alphaPerC: number;
  probes: { ph: SimProbe; ec: SimProbe; temp: SimProbe };
  credential: DeviceCredential;
}

const tankRow = z.object({
  id: z.number().int(),
  name: z.string(),
  controller_id: z.string(),
  ph_min: z.number(),
  ph_max: z.number(),
  ec_min_us: z.number(),
  ec_max_us: z.number(),
  temp_min: z.number(),
  temp_max: z.number(),
  ec_alpha_per_c: z.number(),
});
const probeRow = z.object({
  id: z.number().int(),
  tank_id: z.number().int(),
  kind: z.enum(["ph", "ec", "temp"]),
  serial: z.string(),
  installed_at: z.number().int(),
  nominal_cell_constant: z.number().nullable(),
});
const runRow = z.object({
  probe_id: z.number().int(),
  effective_at: z.number().int(),
  slope_pct: z.number().nullable(),
  offset_mv: z.number().nullable(),
  cell_constant: z.number().nullable(),
});

export function readCredentials(file: string): DeviceCredential[] {
  if (!fs.existsSync(file)) throw new Error(`no device credentials at ${file}: run the seed (npm run db:seed) or pass --credentials`);
  return credentialsFile.parse(JSON.parse(fs.readFileSync(file, "utf8")));
}

export async function loadFleet(db: DbClient, credentials: DeviceCredential[], now = Date.now()): Promise<{ tanks: SimTank[]; skipped: string[] }> {
  const [tanks, probes, runs] = await Promise.all([
    db.execute(
      `SELECT t.id, t.name, t.controller_id, t.ph_min, t.ph_max, t.ec_min_us, t.ec_max_us, t.temp_min, t.temp_max, t.ec_alpha_per_c
         FROM tanks t JOIN devices d ON d.controller_id = t.controller_id AND d.revoked_at IS NULL
        WHERE t.controller_id IS NOT NULL ORDER BY t.id`,
    ),
    db.execute("SELECT id, tank_id, kind, serial, installed_at, nominal_cell_constant FROM probes WHERE status != 'retired' AND retired_at IS NULL ORDER BY id"),
    db.execute({
      sql: `SELECT probe_id, effective_at, slope_pct, offset_mv, cell_constant FROM calibration_runs
             WHERE status = 'accepted' AND effective_at IS NOT NULL AND effective_at <= ? ORDER BY effective_at`,
      args: [now],
    }),
  ]);
  const lastRun = new Map<number, z.infer<typeof runRow>>();
  for (const r of runs.rows) {
    const run = runRow.parse(r);
    const prev = lastRun.get(run.probe_id);
    // A one-point run keeps the previous slope; carry it forward like the ingest does.
    lastRun.set(run.probe_id, { ...run, slope_pct: run.slope_pct ?? prev?.slope_pct ?? null, cell_constant: run.cell_constant ?? prev?.cell_constant ?? null });
  }
  const probesByTank = new Map<number, Partial<SimTank["probes"]>>();
  for (const r of probes.rows) {
    const p = probeRow.parse(r);
    const set = probesByTank.get(p.tank_id) ?? {};
    if (set[p.kind]) continue; // the first active probe of each kind
    const run = lastRun.get(p.id);
    set[p.kind] = {
      id: p.id,
      serial: p.serial,
      installedAt: p.installed_at,
      nominalCellConstant: p.nominal_cell_constant,
      calibration: run ? { effectiveAt: run.effective_at, slopePct: run.slope_pct, offsetMv: run.offset_mv, cellConstant: run.cell_constant } : null,
    };
    probesByTank.set(p.tank_id, set);
  }
  const byController = new Map(credentials.map((c) => [c.controllerId, c]));
  const out: SimTank[] = [];
  const skipped: string[] = [];
  for (const r of tanks.rows) {
    const t = tankRow.parse(r);
    const set = probesByTank.get(t.id);
    const credential = byController.get(t.controller_id);
    if (!set?.ph || !set.ec || !set.temp || !credential) {
      skipped.push(`${t.name} (${!credential ? "no credentials" : "missing a pH, EC or temperature probe"})`);
      continue;
    }
    out.push({
      id: t.id,
      name: t.name,
      controllerId: t.controller_id,
      band: { phMin: t.ph_min, phMax: t.ph_max, ecMinUs: t.ec_min_us, ecMaxUs: t.ec_max_us, tempMin: t.temp_min, tempMax: t.temp_max },
      alphaPerC: t.ec_alpha_per_c,
      probes: { ph: set.ph, ec: set.ec, temp: set.temp },
      credential,
    });
  }
  return { tanks: out, skipped };
}
