import { CalibrationInputError } from "./errors";
import { requireFinite } from "./guards";
import { fmtTemp } from "./format";
import { interpolateTable, type TemperatureTable } from "./interpolate";

/** Buffers Tidewell knows by id. */
export type BufferId =
  | "phthalate-0.05m"
  | "phosphate-0.025m"
  | "borax-0.01m"
  | "tech-4.01"
  | "tech-7.00"
  | "tech-10.01";

/** A buffer's own table from its certificate: rows of [tempC, pH]. */
export interface BufferTable {
  points: readonly (readonly [number, number])[];
}

export type BufferSpec = BufferId | BufferTable;

export interface BufferInfo {
  label: string;
  /** pH at 25 °C. */
  nominalPh25: number;
  /** Temperatures (°C) at which the buffer's pH is known. */
  rangeC: readonly [number, number];
  source: string;
}

/**
 * Hamer, Pinching and Acree, J. Res. NBS 36 (1946) 47, for 0.05 mol/kg potassium
 * hydrogen phthalate, 0–60 °C. The paper defines T = t + 273.16 (not 273.15);
 * the difference is below 0.0001 pH here.
 */
const PHTHALATE_RANGE_C = [0, 60] as const;
function phthalatePh(tempC: number): number {
  const T = tempC + 273.16;
  return 1336.08 / T - 5.2678 + 0.016069 * T;
}

/**
 * 0.025/0.025 mol/kg phosphate: 25 °C 6.865 from IUPAC 2002 (Buck et al., Pure
 * Appl. Chem. 74, 2169); the other rows are from memory of the NBS/IUPAC table.
 */
const PHOSPHATE: TemperatureTable = [
  [10, 6.923],
  [15, 6.9],
  [20, 6.881],
  [25, 6.865],
  [30, 6.853],
  [35, 6.844],
  [40, 6.838],
];

/** 0.01 mol/kg borax: 25 °C 9.180 from IUPAC 2002; other rows from memory. */
const BORAX: TemperatureTable = [
  [10, 9.332],
  [15, 9.276],
  [20, 9.225],
  [25, 9.18],
  [30, 9.139],
  [35, 9.102],
  [40, 9.068],
];

/** Commercial technical buffers: typical maker tables, from memory. */
const TECH_4_01: TemperatureTable = [
  [10, 4.0],
  [15, 4.0],
  [20, 4.0],
  [25, 4.01],
  [30, 4.01],
  [35, 4.02],
];
const TECH_7_00: TemperatureTable = [
  [10, 7.07],
  [15, 7.04],
  [20, 7.02],
  [25, 7.0],
  [30, 6.99],
  [35, 6.98],
];
const TECH_10_01: TemperatureTable = [
  [10, 10.18],
  [15, 10.12],
  [20, 10.06],
  [25, 10.01],
  [30, 9.97],
  [35, 9.93],
];

const TABLES: Record<Exclude<BufferId, "phthalate-0.05m">, TemperatureTable> = {
  "phosphate-0.025m": PHOSPHATE,
  "borax-0.01m": BORAX,
  "tech-4.01": TECH_4_01,
  "tech-7.00": TECH_7_00,
  "tech-10.01": TECH_10_01,
};

export const BUFFERS: Readonly<Record<BufferId, BufferInfo>> = {
  "phthalate-0.05m": {
    label: "Phthalate 0.05 mol/kg (pH 4.005)",
    nominalPh25: 4.005,
    rangeC: PHTHALATE_RANGE_C,
    source: "Hamer, Pinching and Acree, J. Res. NBS 36 (1946)",
  },
  "phosphate-0.025m": {
    label: "Phosphate 0.025 mol/kg (pH 6.865)",
    nominalPh25: 6.865,
    rangeC: [10, 40],
    source: "IUPAC 2002, Buck et al. (25 °C); other temperatures from memory",
  },
  "borax-0.01m": {
    label: "Borax 0.01 mol/kg (pH 9.180)",
    nominalPh25: 9.18,
    rangeC: [10, 40],
    source: "IUPAC 2002, Buck et al. (25 °C); other temperatures from memory",
  },
  "tech-4.01": {
    label: "Technical buffer pH 4.01",
    nominalPh25: 4.01,
    rangeC: [10, 35],
    source: "typical maker table, from memory",
  },
  "tech-7.00": {
    label: "Technical buffer pH 7.00",
    nominalPh25: 7.0,
    rangeC: [10, 35],
    source: "typical maker table, from memory",
  },
  "tech-10.01": {
    label: "Technical buffer pH 10.01",
    nominalPh25: 10.01,
    rangeC: [10, 35],
    source: "typical maker table, from memory",
  },
};

export const BUFFER_IDS = Object.keys(BUFFERS) as readonly BufferId[];

function isBufferId(value: unknown): value is BufferId {
  return typeof value === "string" && Object.prototype.hasOwnProperty.call(BUFFERS, value);
}

/** Checks a user table and returns it sorted by temperature. */
export function normaliseBufferTable(table: BufferTable): TemperatureTable {
  const points: unknown = (table as { points?: unknown }).points;
  if (!Array.isArray(points) || points.length === 0) {
    throw new CalibrationInputError(
      "invalid-table",
      "A buffer table needs at least one row of [temperature °C, pH]",
    );
  }
  const rows = points.map((row: unknown, i): [number, number] => {
    if (!Array.isArray(row) || row.length !== 2) {
      throw new CalibrationInputError(
        "invalid-table",
        `Row ${i + 1} of the buffer table must be [temperature °C, pH]`,
      );
    }
    const t = requireFinite(row[0], `Temperature in row ${i + 1} of the buffer table`);
    const ph = requireFinite(row[1], `pH in row ${i + 1} of the buffer table`);
    if (ph < 0 || ph > 14) {
      throw new CalibrationInputError(
        "invalid-table",
        `pH ${ph} in row ${i + 1} of the buffer table is outside 0–14; check the certificate`,
      );
    }
    return [t, ph];
  });
  rows.sort((a, b) => a[0] - b[0]);
  for (let i = 1; i < rows.length; i++) {
    if (rows[i][0] === rows[i - 1][0]) {
      throw new CalibrationInputError(
        "invalid-table",
        `The buffer table lists ${rows[i][0]} °C twice; keep one row per temperature`,
      );
    }
  }
  return rows;
}

/** Human-readable name of a buffer for messages. */
export function bufferName(buffer: BufferSpec): string {
  return typeof buffer === "string" ? `buffer ${buffer}` : "the custom buffer";
}

/** True when two specs name the same buffer (same id, or equal tables). */
export function sameBuffer(a: BufferSpec, b: BufferSpec): boolean {
  if (typeof a === "string" || typeof b === "string") return a === b;
  const ta = normaliseBufferTable(a);
  const tb = normaliseBufferTable(b);
  return ta.length === tb.length && ta.every((r, i) => r[0] === tb[i][0] && r[1] === tb[i][1]);
}

/**
 * pH of a buffer at a temperature. Tables are interpolated linearly; a
 * temperature outside the buffer's range throws.
 */
export function bufferPh(buffer: BufferSpec, tempC: number): number {
  const t = requireFinite(tempC, "Buffer temperature");
  if (typeof buffer === "object" && buffer !== null) {
    return interpolateTable(normaliseBufferTable(buffer), t, "The custom buffer's pH");
  }
  if (!isBufferId(buffer)) {
    throw new CalibrationInputError(
      "unknown-buffer",
      `Unknown buffer "${String(buffer)}"; choose one of ${BUFFER_IDS.join(", ")} or enter the buffer's own table`,
    );
  }
  if (buffer === "phthalate-0.05m") {
    const [lo, hi] = PHTHALATE_RANGE_C;
    if (t < lo || t > hi) {
      throw new CalibrationInputError(
        "temperature-out-of-range",
        `The pH of buffer phthalate-0.05m is known only from ${fmtTemp(lo)} to ${fmtTemp(hi)}; ${fmtTemp(t)} is outside that range`,
      );
    }
    return phthalatePh(t);
  }
  return interpolateTable(TABLES[buffer], t, `The pH of buffer ${buffer}`);
}
