/** A horizontal track: the target band shaded, a tick where the value sits. */
export function BandGauge({ value, min, max, label }: { value: number | null; min: number; max: number; label: string }) {
  const span = max - min;
  const lo = min - span * 0.75;
  const hi = max + span * 0.75;
  const pos = (v: number) => Math.min(100, Math.max(0, ((v - lo) / (hi - lo)) * 100));
  const outside = value !== null && (value < min || value > max);
  return (
    <div className="relative h-2.5 w-full rounded-full bg-paper-sunk" role="img" aria-label={label}>
      <div className="absolute inset-y-0 rounded-full bg-accent-200" style={{ left: `${pos(min)}%`, right: `${100 - pos(max)}%` }} />
      {value !== null ? (
        <div
          className={`absolute -top-1 h-4.5 w-1.5 -translate-x-1/2 rounded-sm ${outside ? "bg-bad" : "bg-ink"}`}
          style={{ left: `${pos(value)}%` }}
        />
      ) : null}
    </div>
  );
}
