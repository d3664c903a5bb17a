import { CircleCheck, OctagonX } from "lucide-react";
import type { Fit } from "@/db/queries/calibration-runs";

/** Slope and offset (or cell constant and deviation), the verdict and the reasons. */
export function FitSummary({ fit }: { fit: Pick<Fit, "verdict" | "reasons"> & Partial<{ slopePct: number; offsetMv: number; cellConstant: number; deviationPct: number; advice: string[] }> }) {
  const accepted = fit.verdict === "accepted";
  const Icon = accepted ? CircleCheck : OctagonX;
  return (
    <div data-verdict={fit.verdict} className="space-y-3">
      <p className={`flex items-center gap-2 text-xl font-semibold ${accepted ? "text-ok" : "text-bad"}`}>
        <Icon className="size-6" aria-hidden /> {accepted ? "Accepted" : "Rejected"}
      </p>
      <dl className="grid grid-cols-2 gap-3 sm:max-w-md">
        {fit.slopePct !== undefined ? (
          <>
            <Metric label="Slope" value={`${fit.slopePct.toFixed(1)} %`} hint="90–105 %" />
            <Metric label="Offset" value={`${fit.offsetMv!.toFixed(1)} mV`} hint="±30 mV" />
          </>
        ) : (
          <>
            <Metric label="Cell constant" value={`${fit.cellConstant!.toPrecision(4)} /cm`} />
            <Metric label="Deviation" value={`${fit.deviationPct! >= 0 ? "+" : ""}${fit.deviationPct!.toFixed(1)} %`} hint="±10 % of nominal" />
          </>
        )}
      </dl>
      {fit.reasons.length ? (
        <ul className={`list-disc space-y-1 pl-5 text-sm ${accepted ? "text-ink-soft" : "text-bad"}`} data-testid="reasons">
          {fit.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      ) : null}
      {fit.advice?.length ? (
        <ul className="list-disc space-y-1 pl-5 text-sm text-warn">
          {fit.advice.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

function Metric({ label, value, hint }: { label: string; value: string; hint?: string }) {
  return (
    <div className="rounded-md border border-paper-line bg-paper p-3">
      <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{label}</dt>
      <dd className="num text-2xl font-semibold">{value}</dd>
      {hint ? <dd className="text-xs text-ink-faint">limit {hint}</dd> : null}
    </div>
  );
}
