// The addresses printed on tank and probe labels. They are short (a smaller QR code scans better
// through a wet phone camera) and go through /go/…, which sends a signed-out phone to sign-in and
// back, and decides at scan time whether a probe's calibration run is started or resumed.
import { z } from "zod";

export const LABEL_KINDS = ["tank", "probe"] as const;
export type LabelKind = (typeof LABEL_KINDS)[number];

export const labelParams = z.object({ kind: z.enum(LABEL_KINDS), id: z.coerce.number().int().positive() });

export function labelPath(kind: LabelKind, id: number): string {
  return `/go/${kind}/${id}`;
}

/** The absolute address a label's QR code holds. */
export function labelUrl(base: string, kind: LabelKind, id: number): string {
  return new URL(labelPath(kind, id), base).toString();
}

/** The two printed formats: a 21-up A4 sheet (70 × 42.3 mm) and a 57 × 32 mm label roll. */
export const LABEL_FORMATS = {
  a4: { title: "A4 sheet, 21 labels (70 × 42.3 mm)", widthMm: 70, heightMm: 42.3, qrMm: 28 },
  roll: { title: "Label roll, 57 × 32 mm", widthMm: 57, heightMm: 32, qrMm: 24 },
} as const;
export type LabelFormat = keyof typeof LABEL_FORMATS;
