"use client";
// pH, EC and temperature of one tank over a chosen range. Rolling ranges follow now: the live
// stream appends to their cached series; a custom range is fetched once and stays as it is.
import { useMemo, useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { format } from "date-fns";
import { TimeSeriesChart, type ChartMarkers } from "@/components/charts/time-series-chart";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { fetchSeries, seriesKey, type CachedSeries } from "@/components/live/queries";
import { ecDecimals, ecInUnit, ecUnitLabel, type EcUnit } from "@/lib/display/units";
import { formatDuration } from "@/lib/display/time";

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const MAX_RANGE_MS = 31 * DAY;

const RANGES = [
  { key: "1h", label: "1 h", span: HOUR, points: 720 },
  { key: "24h", label: "24 h", span: DAY, points: 1440 },
  { key: "7d", label: "7 d", span: 7 * DAY, points: 2000 },
  { key: "30d", label: "30 d", span: 30 * DAY, points: 2000 },
] as const;
type RangeKey = (typeof RANGES)[number]["key"] | "custom";

const toInput = (ms: number) => format(ms, "yyyy-MM-dd'T'HH:mm");

export function TankCharts({ tankId, ecUnit, renderedAt }: { tankId: number; ecUnit: EcUnit; renderedAt: number }) {
  const [range, setRange] = useState<RangeKey>("24h");
  const [custom, setCustom] = useState<{ from: number; to: number }>({ from: renderedAt - DAY, to: renderedAt });
  const [draft, setDraft] = useState({ from: toInput(renderedAt - DAY), to: toInput(renderedAt) });
  const [draftError, setDraftError] = useState<string | null>(null);

  const preset = RANGES.find((r) => r.key === range);
  const view = preset ? preset.key : `custom:${custom.from}-${custom.to}`;
  const query = useQuery({
    queryKey: seriesKey(tankId, view),
    queryFn: () => {
      if (preset) {
        const now = Date.now();
        return fetchSeries(tankId, now - preset.span, now, preset.points, preset.span);
      }
      return fetchSeries(tankId, custom.from, custom.to, 1500, null);
    },
    placeholderData: keepPreviousData,
    staleTime: preset ? 5 * 60_000 : Infinity,
  });

  const applyCustom = (e: React.FormEvent) => {
    e.preventDefault();
    const from = new Date(draft.from).getTime();
    const to = new Date(draft.to).getTime();
    if (!Number.isFinite(from) || !Number.isFinite(to)) return setDraftError("Enter both a start and an end.");
    if (to <= from) return setDraftError("The end must come after the start.");
    if (to - from > MAX_RANGE_MS) return setDraftError("A range can be at most 31 days.");
    setDraftError(null);
    setCustom({ from, to });
    setRange("custom");
  };

  const data = query.data;
  return (
    <section aria-label="Charts" className="rounded-lg border border-paper-line bg-paper-raised p-4">
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <div role="group" aria-label="Range" className="inline-flex rounded-md border border-paper-line bg-paper p-0.5">
          {RANGES.map((r) => (
            <button
              key={r.key}
              type="button"
              aria-pressed={range === r.key}
              onClick={() => setRange(r.key)}
              className={cn("h-10 min-w-14 rounded px-3 text-sm font-medium", range === r.key ? "bg-accent-700 text-white" : "text-ink-soft hover:bg-paper-sunk")}
            >
              {r.label}
            </button>
          ))}
          <button
            type="button"
            aria-pressed={range === "custom"}
            onClick={() => setRange("custom")}
            className={cn("h-10 rounded px-3 text-sm font-medium", range === "custom" ? "bg-accent-700 text-white" : "text-ink-soft hover:bg-paper-sunk")}
          >
            Custom
          </button>
        </div>
        <p className="num text-xs text-ink-faint" data-testid="series-meta">
          {data
            ? `${data.source === "hourly-rollups" ? "hourly summaries" : data.source === "rollups" ? "per-minute summaries" : "raw readings"} · one point per ${formatBucket(data.bucketMs)}${query.isFetching ? " · updating…" : ""}`
            : query.isError
              ? ""
              : "loading…"}
        </p>
      </div>

      {range === "custom" ? (
        <form onSubmit={applyCustom} className="mb-4 flex flex-wrap items-end gap-3 text-sm">
          <label className="flex flex-col gap-1">
            <span className="text-ink-soft">From</span>
            <input type="datetime-local" value={draft.from} onChange={(e) => setDraft({ ...draft, from: e.target.value })} className="h-10 rounded-md border border-paper-line bg-paper-raised px-2" />
          </label>
          <label className="flex flex-col gap-1">
            <span className="text-ink-soft">To</span>
            <input type="datetime-local" value={draft.to} onChange={(e) => setDraft({ ...draft, to: e.target.value })} className="h-10 rounded-md border border-paper-line bg-paper-raised px-2" />
          </label>
          <Button type="submit" variant="secondary">
            Show range
          </Button>
          {draftError ? (
            <p role="alert" className="w-full text-bad">
              {draftError}
            </p>
          ) : null}
        </form>
      ) : null}

      {query.isError ? (
        <p role="alert" className="py-8 text-center text-bad">
          The charts could not be loaded: {(query.error as Error).message}
        </p>
      ) : data ? (
        <ChartStack data={data} ecUnit={ecUnit} />
      ) : (
        <div className="h-[44rem] animate-pulse rounded-md bg-paper-sunk" />
      )}

      <p className="mt-3 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft">
        <span>
          <span className="mr-1 inline-block h-3 w-5 translate-y-0.5 rounded-sm border border-dashed border-accent-700 bg-accent-100" aria-hidden />
          target band
        </span>
        <span>
          <span className="mr-1 inline-block h-3 w-5 translate-y-0.5 rounded-sm bg-ink/15" aria-hidden />
          lowest–highest in each point
        </span>
        <span>
          <span className="mr-1 inline-block h-3 w-5 translate-y-0.5 rounded-sm bg-held/20" aria-hidden />
          on hold
        </span>
        <span>▼ calibration (solid: accepted, dashed: rejected)</span>
      </p>
    </section>
  );
}

function ChartStack({ data, ecUnit }: { data: CachedSeries; ecUnit: EcUnit }) {
  const convertEc = useMemo(() => (v: number) => ecInUnit(v, ecUnit), [ecUnit]);
  const markers = useMemo(() => {
    const holds = data.holds.map((h) => ({ from: h.placedAt, to: h.endAt ?? Math.max(data.to, h.plannedEndAt), label: h.reason }));
    const forKind = (kind: "ph" | "ec"): ChartMarkers => ({
      holds,
      calibrations: data.calibrations.filter((c) => c.kind === kind).map((c) => ({ at: c.at, label: c.status, accepted: c.status === "accepted" })),
    });
    return { ph: forKind("ph"), ec: forKind("ec"), temp: { holds, calibrations: [] } };
  }, [data.holds, data.calibrations, data.to]);
  const ecBand = useMemo<[number, number]>(() => [ecInUnit(data.band.ec[0], ecUnit), ecInUnit(data.band.ec[1], ecUnit)], [data.band.ec, ecUnit]);
  return (
    <div className="space-y-5">
      <TimeSeriesChart label="pH" unit="" decimals={2} buckets={data.series.ph} from={data.from} to={data.to} band={data.band.ph} markers={markers.ph} />
      <TimeSeriesChart label="EC" unit={ecUnitLabel(ecUnit)} decimals={ecDecimals(ecUnit)} buckets={data.series.ec} from={data.from} to={data.to} band={ecBand} convert={convertEc} markers={markers.ec} />
      <TimeSeriesChart label="Temperature" unit="°C" decimals={1} buckets={data.series.temp} from={data.from} to={data.to} band={data.band.temp} markers={markers.temp} />
    </div>
  );
}

function formatBucket(ms: number) {
  if (ms < 60_000) return `${ms / 1000} s`;
  if (ms % 3_600_000 === 0) return `${ms / 3_600_000} h`; // hourly buckets: "6 h", not "6 h 0 min"
  return formatDuration(ms);
}
