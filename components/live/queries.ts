// Query keys and fetchers shared by the wall, the tank page and the live bridge that keeps them current.
import type { TankOverview } from "@/db/queries/overview";
import type { TankSeries } from "@/app/api/tanks/[id]/series/load-series";

export interface TankScope {
  site?: number;
  tank?: number;
}

/** Series as cached: `rolling` is the window length when the view follows now, null for a fixed range. */
export type CachedSeries = TankSeries & { rolling: number | null };

export const tanksKey = (scope: TankScope) => ["tanks", scope.site ?? null, scope.tank ?? null] as const;
export const seriesKey = (tankId: number, view: string) => ["series", tankId, view] as const;

async function getJson<T>(url: string): Promise<T> {
  const res = await fetch(url, { cache: "no-store" });
  if (!res.ok) {
    const body = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
    throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
  }
  return (await res.json()) as T;
}

export async function fetchTanks(scope: TankScope): Promise<TankOverview[]> {
  if (scope.tank) return [(await getJson<{ tank: TankOverview }>(`/api/tanks/${scope.tank}`)).tank];
  const q = scope.site ? `?site=${scope.site}` : "";
  return (await getJson<{ tanks: TankOverview[] }>(`/api/tanks${q}`)).tanks;
}

export async function fetchSeries(tankId: number, from: number, to: number, points: number, rolling: number | null): Promise<CachedSeries> {
  const series = await getJson<TankSeries>(`/api/tanks/${tankId}/series?from=${Math.round(from)}&to=${Math.round(to)}&points=${points}`);
  return { ...series, rolling };
}

/** The wall's trend sparklines: the last 4 hours in 4-minute buckets, long enough to see a trend. */
export const SPARK_WINDOW_MS = 4 * 60 * 60_000;
export const SPARK_POINTS = 60;
export const SPARK_WINDOW_LABEL = "4 hours";
