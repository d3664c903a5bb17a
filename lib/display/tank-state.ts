// The one word that sums a tank up on the wall, worst first. Pure: overview data in, state out.
export type TankStateKind = "incident" | "out-of-band" | "stale" | "calibration-lapsed" | "held" | "calibration-due" | "in-band" | "no-data";

export const STATE_RANK: Record<TankStateKind, number> = {
  incident: 0,
  "out-of-band": 1,
  stale: 2,
  "calibration-lapsed": 3,
  held: 4,
  "calibration-due": 5,
  "no-data": 6,
  "in-band": 7,
};

export const STATE_LABEL: Record<TankStateKind, string> = {
  incident: "Open incident",
  "out-of-band": "Out of band",
  stale: "Stale",
  "calibration-lapsed": "Calibration lapsed",
  held: "On hold",
  "calibration-due": "Calibration due",
  "no-data": "No data yet",
  "in-band": "In band",
};

export type MeasureState = "in-band" | "low" | "high" | "suspect" | "no-data";

export interface TankStateInput {
  now: number;
  staleAfterMs: number;
  held: boolean;
  openIncidents: number;
  measures: { kind: "ph" | "ec" | "temp"; value: number | null; ts: number | null; quality: string | null; min: number; max: number; calibration: string }[];
}

export function measureState(m: TankStateInput["measures"][number]): MeasureState {
  if (m.value === null || m.ts === null) return "no-data";
  if (m.quality === "suspect") return "suspect";
  if (m.value < m.min) return "low";
  if (m.value > m.max) return "high";
  return "in-band";
}

/** Every state that applies, worst first; the first is the tank's headline. */
export function tankStates(t: TankStateInput): TankStateKind[] {
  const states = new Set<TankStateKind>();
  if (t.openIncidents > 0) states.add("incident");
  if (t.held) states.add("held");
  const withData = t.measures.filter((m) => m.ts !== null);
  if (withData.length === 0) states.add("no-data");
  if (withData.some((m) => t.now - (m.ts ?? 0) > t.staleAfterMs)) states.add("stale");
  if (!t.held && t.measures.some((m) => ["low", "high", "suspect"].includes(measureState(m)))) states.add("out-of-band");
  if (t.measures.some((m) => m.calibration === "lapsed" || m.calibration === "never")) states.add("calibration-lapsed");
  if (t.measures.some((m) => m.calibration === "due-soon")) states.add("calibration-due");
  if (states.size === 0) states.add("in-band");
  return [...states].sort((a, b) => STATE_RANK[a] - STATE_RANK[b]);
}
