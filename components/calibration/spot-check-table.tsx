import { CircleCheck, TriangleAlert } from "lucide-react";
import type { spotChecks } from "@/db/schema";
import { formatDateTime } from "@/lib/display/time";
import { formatEc, ecUnitLabel, type EcUnit } from "@/lib/display/units";
import { SpotCheckRowActions } from "./spot-check-row-actions";

type Row = typeof spotChecks.$inferSelect;

/** Handheld readings against Tidewell's; a difference past the tank's tolerance is called out. Growers and owners can correct or delete a row. */
export function SpotCheckTable({ rows, kind, tolerance, ecUnit, canChange = false }: { rows: Row[]; kind: "ph" | "ec" | "temp"; tolerance: number; ecUnit: EcUnit; canChange?: boolean }) {
  const editable = canChange && kind !== "temp";
  const show = (v: number | null) => (v === null ? "—" : kind === "ph" ? v.toFixed(2) : formatEc(v, ecUnit));
  const unit = kind === "ph" ? "pH" : ecUnitLabel(ecUnit);
  if (rows.length === 0) return <p className="text-sm text-ink-soft">No spot checks yet.</p>;
  return (
    <table className="w-full min-w-[640px] text-sm" data-testid="spot-checks">
      <thead className="border-b border-paper-line text-left text-xs uppercase tracking-wide text-ink-soft">
        <tr>
          <th className="py-2 pr-3">Taken</th>
          <th className="py-2 pr-3">Meter ({unit})</th>
          <th className="py-2 pr-3">Tidewell ({unit})</th>
          <th className="py-2 pr-3">Difference</th>
          <th className="py-2">Verdict (tolerance ±{kind === "ph" ? tolerance.toFixed(2) : formatEc(tolerance, ecUnit)})</th>
          {editable ? (
            <th className="py-2">
              <span className="sr-only">Correct or delete</span>
            </th>
          ) : null}
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.id} data-spot-check={r.id} data-past-tolerance={r.pastTolerance} className="border-b border-paper-line last:border-0">
            <td className="num py-2 pr-3">{formatDateTime(r.takenAt)}</td>
            <td className="num py-2 pr-3">{show(r.meterValue)}</td>
            <td className="num py-2 pr-3">{show(r.tidewellValue)}</td>
            <td className="num py-2 pr-3">{r.difference === null ? "—" : `${r.difference >= 0 ? "+" : "−"}${kind === "ph" ? Math.abs(r.difference).toFixed(3) : show(Math.abs(r.difference))}`}</td>
            <td className="py-2">
              {r.tidewellValue === null ? (
                <span className="text-ink-soft">No Tidewell reading within ±2 min</span>
              ) : r.pastTolerance ? (
                <span className="inline-flex items-center gap-1 font-semibold text-bad">
                  <TriangleAlert className="size-4" aria-hidden /> Past tolerance: recalibrate
                </span>
              ) : (
                <span className="inline-flex items-center gap-1 text-ok">
                  <CircleCheck className="size-4" aria-hidden /> Within tolerance
                </span>
              )}
              {r.note ? <span className="block text-xs text-ink-soft">{r.note}</span> : null}
            </td>
            {editable ? (
              <td className="py-1">
                <SpotCheckRowActions row={{ id: r.id, takenAt: r.takenAt, meterValue: r.meterValue, note: r.note }} kind={kind === "ec" ? "ec" : "ph"} ecUnit={ecUnit} />
              </td>
            ) : null}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
