// How a batch of live readings changes cached data. Each returns a new object (or the same one
// when nothing changed), so TanStack Query re-renders only what moved.
import type { TankOverview } from "@/db/queries/overview";
import type { StreamReading } from "@/server/stream/backfill";
import { appendReading } from "@/lib/display/downsample";
import type { CachedSeries } from "./queries";

/** Newer readings replace each probe's latest value; replays of older ones are ignored. */
export function withLatestReadings(tanks: TankOverview[] | undefined, tankId: number, readings: StreamReading[]): TankOverview[] | undefined {
  if (!tanks) return tanks;
  const index = tanks.findIndex((t) => t.id === tankId);
  if (index === -1) return tanks;
  const tank = tanks[index];
  let changed = false;
  const probes = tank.probes.map((p) => {
    let latest = p.latest;
    for (const r of readings) {
      if (r.probeId !== p.id || (latest && latest.ts >= r.ts)) continue;
      latest = { ts: r.ts, value: r.value, quality: r.quality };
    }
    if (latest === p.latest) return p;
    changed = true;
    return { ...p, latest };
  });
  if (!changed) return tanks;
  const next = [...tanks];
  next[index] = { ...tank, probes };
  return next;
}

/** Appends readings to a view that follows now; a fixed range stays as fetched. */
export function withAppendedReadings(series: CachedSeries | undefined, readings: StreamReading[]): CachedSeries | undefined {
  if (!series || series.rolling === null || !readings.length) return series;
  const next = { ...series, series: { ...series.series } };
  let to = series.to;
  for (const r of readings) {
    to = Math.max(to, r.ts + 1);
    next.series[r.kind] = appendReading(next.series[r.kind], r, to - series.rolling);
  }
  next.to = to;
  next.from = to - series.rolling;
  return next;
}

/** A refetched overview, keeping any probe's latest reading the stream already brought that is newer. */
export function keepNewerLatest(fresh: TankOverview[], old: TankOverview[] | undefined): TankOverview[] {
  if (!old) return fresh;
  const known = new Map(old.flatMap((t) => t.probes.map((p) => [p.id, p.latest] as const)));
  return fresh.map((t) => ({
    ...t,
    probes: t.probes.map((p) => {
      const mine = known.get(p.id);
      return mine && (!p.latest || mine.ts > p.latest.ts) ? { ...p, latest: mine } : p;
    }),
  }));
}
