import Link from "next/link";
import { MEASURE_SHORT } from "@/lib/display/labels";
import { format } from "date-fns";
import { PauseCircle } from "lucide-react";
import type { TankOverview } from "@/db/queries/overview";
import { formatEc, ecInUnit, ecUnitLabel, type EcUnit } from "@/lib/display/units";
import { measureState, tankStates } from "@/lib/display/tank-state";
import { CalibrationBadge, StateBadge } from "./state-badge";
import { BandGauge } from "./band-gauge";
import { cn } from "@/components/ui/cn";
import { TankTileActions } from "@/components/incidents/tank-tile-actions";
import { Sparkline } from "@/components/charts/sparkline";
import { SPARK_MIN_SPAN } from "@/lib/display/spark-range";
import { SPARK_WINDOW_LABEL } from "@/components/live/queries";
import type { TankSeries } from "@/app/api/tanks/[id]/series/load-series";

export const STALE_AFTER_MS = 2 * 60_000;

export function toStateInput(t: TankOverview, now: number) {
  const probe = (k: "ph" | "ec" | "temp") => t.probes.find((p) => p.kind === k);
  const bands = { ph: [t.band.phMin, t.band.phMax], ec: [t.band.ecMinUs, t.band.ecMaxUs], temp: [t.band.tempMin, t.band.tempMax] } as const;
  return {
    now,
    staleAfterMs: STALE_AFTER_MS,
    held: t.hold !== null,
    openIncidents: t.openIncidents.length,
    measures: (["ph", "ec", "temp"] as const).map((kind) => {
      const p = probe(kind);
      return {
        kind,
        value: p?.latest?.value ?? null,
        ts: p?.latest?.ts ?? null,
        quality: p?.latest?.quality ?? null,
        min: bands[kind][0],
        max: bands[kind][1],
        calibration: p?.calibration.status ?? "never",
      };
    }),
  };
}

const SIDE_WORD = { low: "low", high: "high", suspect: "suspect", "no-data": "no data", "in-band": "" } as const;

/**
 * One tank on the wall: current pH, EC and temperature against the target band, a half-hour trend
 * per measure, and the tank's state in words, shape and colour. Renders on the server (tank list)
 * and inside the live wall, where `spark` is kept current from the stream.
 */
export function TankTile({
  tank,
  now,
  ecUnit,
  wall = false,
  spark,
}: {
  tank: TankOverview;
  now: number;
  ecUnit: EcUnit;
  wall?: boolean;
  spark?: Pick<TankSeries, "series" | "from" | "to">;
}) {
  const input = toStateInput(tank, now);
  const states = tankStates(input);
  const headline = states[0];
  const alarming = headline === "incident" || headline === "out-of-band";
  return (
    <article
      data-tank={tank.id}
      data-tank-state={headline}
      className={cn(
        "flex min-w-0 flex-col rounded-xl border bg-paper-raised p-4",
        alarming ? "border-bad/60 ring-2 ring-bad/30" : headline === "held" ? "border-held/40 border-dashed" : "border-paper-line",
        // Shape as well as colour: an alarming tank carries a thick bar down its left edge.
        alarming && "border-l-8 border-l-bad",
        wall && "p-5",
      )}
    >
      <header className="flex items-start justify-between gap-2">
        <div className="min-w-0">
          <Link href={`/tanks/${tank.id}`} className={cn("block truncate font-semibold hover:underline", wall ? "text-2xl" : "text-lg")}>
            {tank.name}
          </Link>
          <p className="truncate text-xs text-ink-soft">
            {tank.siteName}
            {tank.zoneName ? ` · ${tank.zoneName}` : ""} · {tank.crop}
          </p>
        </div>
        <StateBadge state={headline} large={wall} />
      </header>

      <dl className="mt-4 mb-4 grid grid-cols-3 gap-3">
        {input.measures.map((m) => {
          const state = measureState(m);
          const display =
            m.kind === "ec"
              ? formatEc(m.value, ecUnit)
              : m.value === null
                ? "—"
                : m.value.toFixed(m.kind === "ph" ? 2 : 1);
          const band =
            m.kind === "ec"
              ? `${formatEc(m.min, ecUnit)}–${formatEc(m.max, ecUnit)}`
              : `${m.min.toFixed(m.kind === "ph" ? 1 : 0)}–${m.max.toFixed(m.kind === "ph" ? 1 : 0)}`;
          const out = state !== "in-band";
          return (
            <div key={m.kind} data-measure={m.kind} data-measure-state={state}>
              <dt className={cn("font-semibold tracking-wide text-ink-soft", wall ? "text-base" : "text-xs")}>
                {MEASURE_SHORT[m.kind]}
                <span className="ml-1 normal-case tracking-normal text-ink-faint">{m.kind === "ec" ? ecUnitLabel(ecUnit) : m.kind === "temp" ? "°C" : ""}</span>
              </dt>
              <dd className={cn("num font-semibold leading-tight", wall ? "text-5xl" : "text-3xl", out && !tank.hold && state !== "no-data" ? "text-bad" : "text-ink")}>
                {display}
              </dd>
              {spark ? (
                <div className="mt-1.5">
                  <Sparkline
                    buckets={spark.series[m.kind]}
                    from={spark.from}
                    to={spark.to}
                    band={[m.min, m.max]}
                    convert={m.kind === "ec" ? (v) => ecInUnit(v, ecUnit) : undefined}
                    minSpan={m.kind === "ph" ? SPARK_MIN_SPAN.ph : m.kind === "temp" ? SPARK_MIN_SPAN.temp : ecInUnit(SPARK_MIN_SPAN.ecMsPerCm * 1000, ecUnit)}
                    label={`${MEASURE_SHORT[m.kind]} over the last ${SPARK_WINDOW_LABEL}`}
                    large={wall}
                  />
                </div>
              ) : null}
              <div className="mt-1.5">
                <BandGauge
                  value={m.value === null ? null : m.kind === "ec" ? ecInUnit(m.value, ecUnit) : m.value}
                  min={m.kind === "ec" ? ecInUnit(m.min, ecUnit) : m.min}
                  max={m.kind === "ec" ? ecInUnit(m.max, ecUnit) : m.max}
                  label={`${MEASURE_SHORT[m.kind]} target band ${band}`}
                />
              </div>
              <p className={cn("num mt-1 text-ink-faint", wall ? "text-sm" : "text-[11px]")}>
                {out && SIDE_WORD[state] ? <span className="font-semibold text-bad">{SIDE_WORD[state]} · </span> : null}
                band {band}
              </p>
            </div>
          );
        })}
      </dl>

      <footer className={cn("mt-auto flex flex-wrap items-center gap-x-4 gap-y-1 border-t border-paper-line pt-3", wall ? "text-sm" : "text-xs")}>
        {tank.probes
          .filter((p) => p.kind !== "temp")
          .map((p) => (
            <span key={p.id} className="inline-flex items-center gap-1 text-ink-soft">
              {MEASURE_SHORT[p.kind]} calibration <CalibrationBadge status={p.calibration.status} />
            </span>
          ))}
        {tank.hold ? (
          <span className="inline-flex items-center gap-1 font-medium text-held" suppressHydrationWarning>
            <PauseCircle className="size-3.5" aria-hidden /> Held until {format(tank.hold.plannedEndAt, "HH:mm")}
          </span>
        ) : null}
        {tank.openIncidents.length ? (
          <Link href={`/incidents?tank=${tank.id}`} className="font-semibold text-bad hover:underline">
            {tank.openIncidents.length} open incident{tank.openIncidents.length > 1 ? "s" : ""}
          </Link>
        ) : null}
        {states.includes("stale") ? <span className="font-medium text-warn">No reading for over 2 min</span> : null}
        <TankTileActions tank={tank} />
      </footer>
    </article>
  );
}
