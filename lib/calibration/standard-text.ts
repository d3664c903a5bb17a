import { BUFFERS, type BufferSpec, type BufferId } from "./buffers";
import type { EcStandardSpec, EcStandardId } from "./ec-standards";
import { CalibrationInputError } from "./errors";

/**
 * Buffers and standards are stored as text: a known id ("tech-7.00",
 * "kcl-0.01M") or a JSON object (a certificate's table, or an EC standard's
 * EC at 25 °C and coefficient).
 */
export function parseStandardText(text: string): BufferSpec | EcStandardSpec {
  if (!text.trimStart().startsWith("{")) return text as BufferId | EcStandardId;
  try {
    return JSON.parse(text) as BufferSpec | EcStandardSpec;
  } catch {
    throw new CalibrationInputError("invalid-table", "The buffer or standard's table could not be read; enter it again");
  }
}

export const EC_STANDARD_LABELS: Readonly<Record<EcStandardId, string>> = {
  "kcl-0.01m": "KCl 0.01 mol/kg (1408 µS/cm)",
  "kcl-0.1m": "KCl 0.1 mol/kg (12.82 mS/cm)",
  "kcl-0.01M": "KCl 0.01 mol/L (1413 µS/cm)",
};

/** A name for a stored buffer or standard, for screens and records. */
export function standardLabel(text: string): string {
  const spec = parseStandardText(text);
  if (typeof spec === "string") {
    if (spec in BUFFERS) return BUFFERS[spec as BufferId].label;
    if (spec in EC_STANDARD_LABELS) return EC_STANDARD_LABELS[spec as EcStandardId];
    return spec;
  }
  if ("ec25UsPerCm" in spec) return `EC standard ${Number((spec.ec25UsPerCm / 1000).toPrecision(4))} mS/cm at 25 °C`;
  return "Buffer with its certificate table";
}
