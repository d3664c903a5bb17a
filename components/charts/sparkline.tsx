// A small trend line of the last few hours: min–max envelope and mean per bucket, with the target
// band shaded behind it where it is in view. The y-range fits the data (lib/display/spark-range),
// so a slow drift shows as a slope, and a band edge it approaches comes into view.
import type { Buckets } from "@/lib/display/downsample";
import { sparkRange } from "@/lib/display/spark-range";

const W = 120;
const H = 32;

export function Sparkline({
  buckets,
  from,
  to,
  band,
  label,
  convert = (v) => v,
  minSpan,
  large = false,
}: {
  buckets: Buckets | undefined;
  from: number;
  to: number;
  band: [number, number];
  label: string;
  convert?: (v: number) => number;
  /** Smallest y-span shown, in display units (lib/display/spark-range SPARK_MIN_SPAN). */
  minSpan: number;
  large?: boolean;
}) {
  const n = buckets?.t.length ?? 0;
  const lo = convert(band[0]);
  const hi = convert(band[1]);
  const [yMin, yMax] = sparkRange({ min: (buckets?.min ?? []).map(convert), max: (buckets?.max ?? []).map(convert), band: [lo, hi], minSpan });
  const x = (t: number) => ((t - from) / Math.max(1, to - from)) * W;
  const y = (v: number) => H - ((v - yMin) / (yMax - yMin)) * H;
  const half = (buckets?.bucketMs ?? 0) / 2;

  // Gaps longer than three buckets (and six minutes) break the line rather than bridging missing data.
  const gapMs = Math.max(3 * (buckets?.bucketMs ?? 0), 6 * 60_000);
  const segments: string[][] = [];
  let envelopeTop: string[] = [];
  let envelopeBottom: string[] = [];
  const envelopes: string[] = [];
  let prevT = -Infinity;
  for (let i = 0; i < n; i++) {
    const t = buckets!.t[i] + half;
    if (t - prevT > gapMs || segments.length === 0) {
      if (envelopeTop.length) envelopes.push([...envelopeTop, ...envelopeBottom.reverse()].join(" "));
      envelopeTop = [];
      envelopeBottom = [];
      segments.push([]);
    }
    const px = x(t).toFixed(1);
    segments[segments.length - 1].push(`${px},${y(convert(buckets!.mean[i])).toFixed(1)}`);
    envelopeTop.push(`${px},${y(convert(buckets!.max[i])).toFixed(1)}`);
    envelopeBottom.push(`${px},${y(convert(buckets!.min[i])).toFixed(1)}`);
    prevT = t;
  }
  if (envelopeTop.length) envelopes.push([...envelopeTop, ...envelopeBottom.reverse()].join(" "));

  return (
    <div className="relative">
    <svg viewBox={`0 0 ${W} ${H}`} preserveAspectRatio="none" className={large ? "block h-12 w-full overflow-visible" : "block h-8 w-full overflow-visible"} role="img" aria-label={label} data-sparkline={n}>
      {hi > yMin && lo < yMax ? <rect x={0} width={W} y={Math.max(0, y(hi))} height={Math.max(0.5, Math.min(H, y(lo)) - Math.max(0, y(hi)))} className="fill-accent-100" /> : null}
      {envelopes.map((points, i) => (
        <polygon key={`e${i}`} points={points} className="fill-ink/10" />
      ))}
      {segments.map((points, i) =>
        points.length === 1 ? (
          <circle key={i} cx={points[0].split(",")[0]} cy={points[0].split(",")[1]} r={1.2} className="fill-ink" />
        ) : (
          <polyline key={i} points={points.join(" ")} fill="none" className="stroke-ink" strokeWidth={1.5} vectorEffect="non-scaling-stroke" strokeLinejoin="round" />
        ),
      )}
    </svg>
      {n === 0 ? <span className="absolute inset-0 flex items-center justify-center text-[11px] text-ink-faint">no trend yet</span> : null}
    </div>
  );
}
