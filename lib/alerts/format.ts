import type { Band, CalibrationStatus, Measure } from "./types";

const LABEL: Record<Measure, string> = { ph: "pH", ec: "EC", temp: "Temperature" };
const UNIT: Record<Measure, string> = { ph: "", ec: " mS/cm", temp: " °C" };
const DECIMALS: Record<Measure, number> = { ph: 2, ec: 2, temp: 1 };

export function measureLabel(m: Measure): string {
  return LABEL[m];
}

export function probeLabel(m: Measure): string {
  return `${LABEL[m]} probe`;
}

export function unitSuffix(m: Measure): string {
  return UNIT[m];
}

/** A reading value at display precision with its unit: "7.42", "1.20 mS/cm", "21.4 °C". */
export function formatValue(m: Measure, v: number): string {
  return `${v.toFixed(DECIMALS[m])}${UNIT[m]}`;
}

/** A limit as the user typed it (no padding zeros): "6.5", "2 mS/cm". */
export function formatLimit(m: Measure, v: number): string {
  return `${trimNumber(v)}${UNIT[m]}`;
}

export function trimNumber(v: number, maxDecimals = 3): string {
  return String(Number(v.toFixed(maxDecimals)));
}

/** "5.5–6.5", "0.8–1.2 mS/cm", "-5 to 60 °C" (a dash after a minus sign reads badly). */
export function formatBand(m: Measure, b: Band): string {
  const sep = b.min < 0 ? " to " : "–";
  return `${trimNumber(b.min)}${sep}${trimNumber(b.max)}${UNIT[m]}`;
}

/** "45 s", "3 min", "2 h 5 min", "4 d". Rounds down. */
export function formatDuration(ms: number): string {
  const s = Math.max(0, Math.floor(ms / 1000));
  if (s < 60) return `${s} s`;
  const min = Math.floor(s / 60);
  if (min < 60) return `${min} min`;
  const h = Math.floor(min / 60);
  if (h < 24) return min % 60 === 0 ? `${h} h` : `${h} h ${min % 60} min`;
  return `${Math.floor(h / 24)} d`;
}

/** The note appended to reading alerts from a probe that is not trusted. */
export function calibrationNote(status: CalibrationStatus | null): string {
  if (status === "never") return " — probe never calibrated, reading may be off";
  if (status === "lapsed") return " — calibration lapsed, reading may be off";
  return "";
}
