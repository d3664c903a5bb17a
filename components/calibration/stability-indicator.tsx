import { CircleCheck, CircleDashed, Hourglass } from "lucide-react";
import type { LiveJson } from "./types";

/** Stable / settling / no live reading: a word, an icon and a colour, and how far it has come. */
export function StabilityIndicator({ live }: { live: LiveJson | undefined }) {
  if (!live || !live.latest || !live.fresh) {
    return (
      <p data-stability="none" className="flex items-center gap-2 font-semibold text-warn">
        <CircleDashed className="size-5" aria-hidden /> No live reading — check the probe is connected
      </p>
    );
  }
  const { stable, spread, coveredMs, unit, windowMs } = live.stability;
  const moved = `${spread.toFixed(unit === "pH" ? 3 : 2)} ${unit}`;
  const window = `${Math.round(windowMs / 1000)} s`;
  if (stable) {
    return (
      <p data-stability="stable" className="flex items-center gap-2 font-semibold text-ok">
        <CircleCheck className="size-5" aria-hidden /> Stable — moved {moved} over {window}
      </p>
    );
  }
  const pct = Math.min(100, (coveredMs / windowMs) * 100);
  return (
    <div data-stability="settling">
      <p className="flex items-center gap-2 font-semibold text-ink-soft">
        <Hourglass className="size-5" aria-hidden /> Settling — moved {moved} in the last {Math.round(coveredMs / 1000)} s (needs less than {unit === "pH" ? "0.01 pH" : "0.5 %"} over {window})
      </p>
      <div className="mt-2 h-1.5 w-full rounded-full bg-paper-sunk" aria-hidden>
        <div className="h-1.5 rounded-full bg-accent-500" style={{ width: `${pct}%` }} />
      </div>
    </div>
  );
}
