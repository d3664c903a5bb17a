// A small trend line of the last half hour: min–max envelope and mean per bucket, with the target
// band shaded behind it so a drift towards the edge is visible before it crosses.
import type { Buckets } from "@/lib/display/downsample";

const W = 120;
const H = 32;

export function Sparkline({
  buckets,
  from,
  to,
  band,
  label,
  convert = (v) => v,
  large = false,
}: {
  buckets: Buckets | undefined;
  from: number;
  to: number;
  band: [number, number];
  label: string;
  convert?: (v: number) => number;
  large?: boolean;
}) {
  const n = buckets?.t.length ?? 0;
  const lo = convert(band[0]);
  const hi = convert(band[1]);
  let yMin = lo;
  let yMax = hi;
  for (let i = 0; i < n; i++) {
    yMin = Math.min(yMin, convert(buckets!.min[i]));
    yMax = Math.max(yMax, convert(buckets!.max[i]));
  }
  // Room above and below the band, so "in band" reads as a line inside a shaded strip.
  const pad = (yMax - yMin) * 0.4 || 1;
  yMin -= pad;
  yMax += pad;
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
      <rect x={0} width={W} y={y(hi)} height={Math.max(0.5, y(lo) - y(hi))} className="fill-accent-100" />
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
