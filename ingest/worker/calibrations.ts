// The calibrations in force: every accepted run with an effective time, per probe, in time order.
// Re-read on a calibration.saved event and by a cheap periodic poll; a change reports the
// probes it touched and the earliest effective time involved, so readings already written
// with the old calibration can be recomputed.
import type { Client as DbClient } from "@libsql/client";
import { z } from "zod";

const runRow = z.object({
  id: z.number().int(),
  probe_id: z.number().int(),
  effective_at: z.number().int(),
  slope_pct: z.number().nullable(),
  offset_mv: z.number().nullable(),
  cell_constant: z.number().nullable(),
});

/** A run as applied: a one-point pH run (offset only) keeps the slope of the run before it. */
export interface CalibrationInForce {
  id: number;
  probeId: number;
  effectiveAt: number;
  slopePct: number | null;
  offsetMv: number | null;
  cellConstant: number | null;
}

export type RunsByProbe = Map<number, CalibrationInForce[]>;

export const ACCEPTED_RUNS_SQL = `SELECT id, probe_id, effective_at, slope_pct, offset_mv, cell_constant
  FROM calibration_runs WHERE status = 'accepted' AND effective_at IS NOT NULL`;

/** Groups rows by probe in effective order, carrying a missing slope/offset/K forward. */
export function buildRuns(rows: unknown[]): RunsByProbe {
  const byProbe: RunsByProbe = new Map();
  const parsed = rows.map((r) => runRow.parse(r)).sort((a, b) => a.probe_id - b.probe_id || a.effective_at - b.effective_at || a.id - b.id);
  for (const r of parsed) {
    const list = byProbe.get(r.probe_id) ?? [];
    const prev = list[list.length - 1];
    list.push({
      id: r.id,
      probeId: r.probe_id,
      effectiveAt: r.effective_at,
      slopePct: r.slope_pct ?? prev?.slopePct ?? null,
      offsetMv: r.offset_mv ?? prev?.offsetMv ?? null,
      cellConstant: r.cell_constant ?? prev?.cellConstant ?? null,
    });
    byProbe.set(r.probe_id, list);
  }
  return byProbe;
}

/** The run in force at `ts`: the latest with effectiveAt ≤ ts, or null (never calibrated then). */
export function runInForce(runs: readonly CalibrationInForce[] | undefined, ts: number): CalibrationInForce | null {
  if (!runs) return null;
  for (let i = runs.length - 1; i >= 0; i--) if (runs[i].effectiveAt <= ts) return runs[i];
  return null;
}

const key = (r: CalibrationInForce) => `${r.id}:${r.effectiveAt}:${r.slopePct}:${r.offsetMv}:${r.cellConstant}`;

/** Probes whose runs differ between two loads, with the earliest effective time that changed. */
export function diffRuns(before: RunsByProbe, after: RunsByProbe): Map<number, number> {
  const changed = new Map<number, number>();
  for (const probeId of new Set([...before.keys(), ...after.keys()])) {
    const a = new Map((before.get(probeId) ?? []).map((r) => [key(r), r.effectiveAt]));
    const b = new Map((after.get(probeId) ?? []).map((r) => [key(r), r.effectiveAt]));
    let earliest = Infinity;
    for (const [k, at] of a) if (!b.has(k)) earliest = Math.min(earliest, at);
    for (const [k, at] of b) if (!a.has(k)) earliest = Math.min(earliest, at);
    if (earliest !== Infinity) changed.set(probeId, earliest);
  }
  return changed;
}

export async function loadRuns(db: DbClient, probeId?: number): Promise<RunsByProbe> {
  const rs = probeId === undefined ? await db.execute(ACCEPTED_RUNS_SQL) : await db.execute({ sql: `${ACCEPTED_RUNS_SQL} AND probe_id = ?`, args: [probeId] });
  return buildRuns(rs.rows);
}

/** Changes whenever an accepted run is added, withdrawn or edited; one aggregate row to read. */
const FINGERPRINT_SQL = `SELECT count(*) || ':' || coalesce(max(id), 0) || ':' || total(effective_at) || ':' ||
  total(coalesce(slope_pct, 0) + coalesce(offset_mv, 0) * 7 + coalesce(cell_constant, 0) * 13) AS f
  FROM calibration_runs WHERE status = 'accepted' AND effective_at IS NOT NULL`;

export class CalibrationBook {
  private refreshing: Promise<Map<number, number>> | null = null;
  private fingerprint: string | null = null;

  constructor(
    private readonly db: DbClient,
    public runs: RunsByProbe,
  ) {}

  static async open(db: DbClient): Promise<CalibrationBook> {
    return new CalibrationBook(db, await loadRuns(db));
  }

  inForce(probeId: number, ts: number): CalibrationInForce | null {
    return runInForce(this.runs.get(probeId), ts);
  }

  /**
   * Re-reads the runs when their fingerprint changed (always when `force`); resolves with the
   * changed probes (probe id → earliest changed effective time).
   */
  refresh(force = false): Promise<Map<number, number>> {
    this.refreshing ??= (async () => {
      const rs = await this.db.execute(FINGERPRINT_SQL);
      const fingerprint = String(rs.rows[0].f);
      if (!force && fingerprint === this.fingerprint) return new Map<number, number>();
      const runs = await loadRuns(this.db);
      const changed = diffRuns(this.runs, runs);
      this.runs = runs;
      this.fingerprint = fingerprint;
      return changed;
    })().finally(() => (this.refreshing = null));
    return this.refreshing;
  }
}
