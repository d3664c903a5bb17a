import Link from "next/link";
import { PauseCircle } from "lucide-react";
import type { TankOverview } from "@/db/queries/overview";
import { formatEc, ecInUnit, ecUnitLabel, type EcUnit } from "@/lib/display/units";
import { measureState, tankStates } from "@/lib/display/tank-state";
import { CalibrationBadge, StateBadge } from "./state-badge";
import { BandGauge } from "./band-gauge";
import { cn } from "@/components/ui/cn";

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

const MEASURE_LABEL = { ph: "pH", ec: "EC", temp: "Temp" } as const;
const SIDE_WORD = { low: "low", high: "high", suspect: "suspect", "no-data": "no data", "in-band": "" } as const;

export function TankTile({ tank, now, ecUnit, wall = false }: { tank: TankOverview; now: number; ecUnit: EcUnit; wall?: boolean }) {
  const input = toStateInput(tank, now);
  const states = tankStates(input);
  const headline = states[0];
  const alarming = headline === "incident" || headline === "out-of-band";
  return (
    <article
      data-tank={tank.id}
      data-tank-state={headline}
      className={cn(
        "flex flex-col rounded-xl border bg-paper-raised p-4",
        alarming ? "border-bad/60 ring-2 ring-bad/30" : headline === "held" ? "border-held/40 border-dashed" : "border-paper-line",
      )}
    >
      <header className="flex items-start justify-between gap-2">
        <div className="min-w-0">
          <Link href={`/tanks/${tank.id}`} className={cn("block truncate font-semibold hover:underline", wall ? "text-xl" : "text-lg")}>
            {tank.name}
          </Link>
          <p className="truncate text-xs text-ink-soft">
            {tank.siteName}
            {tank.zoneName ? ` · ${tank.zoneName}` : ""} · {tank.crop}
          </p>
        </div>
        <StateBadge state={headline} large={wall} />
      </header>

      <dl className="mt-4 grid grid-cols-3 gap-3">
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
              <dt className="text-xs font-semibold tracking-wide text-ink-soft">
                {MEASURE_LABEL[m.kind]}
                <span className="ml-1 normal-case tracking-normal text-ink-faint">{m.kind === "ec" ? ecUnitLabel(ecUnit) : m.kind === "temp" ? "°C" : ""}</span>
              </dt>
              <dd className={cn("num font-semibold leading-tight", wall ? "text-4xl" : "text-3xl", out && !tank.hold && state !== "no-data" ? "text-bad" : "text-ink")}>
                {display}
              </dd>
              <div className="mt-1.5">
                <BandGauge
                  value={m.value === null ? null : m.kind === "ec" ? ecInUnit(m.value, ecUnit) : m.value}
                  min={m.kind === "ec" ? ecInUnit(m.min, ecUnit) : m.min}
                  max={m.kind === "ec" ? ecInUnit(m.max, ecUnit) : m.max}
                  label={`${MEASURE_LABEL[m.kind]} target band ${band}`}
                />
              </div>
              <p className="num mt-1 text-[11px] text-ink-faint">
                {out && SIDE_WORD[state] ? <span className="font-semibold text-bad">{SIDE_WORD[state]} · </span> : null}
                band {band}
              </p>
            </div>
          );
        })}
      </dl>

      <footer className="mt-4 flex flex-wrap items-center gap-x-4 gap-y-1 border-t border-paper-line pt-3 text-xs">
        {tank.probes
          .filter((p) => p.kind !== "temp")
          .map((p) => (
            <span key={p.id} className="inline-flex items-center gap-1 text-ink-soft">
              {MEASURE_LABEL[p.kind]} calibration <CalibrationBadge status={p.calibration.status} />
            </span>
          ))}
        {tank.hold ? (
          <span className="inline-flex items-center gap-1 font-medium text-held">
            <PauseCircle className="size-3.5" aria-hidden /> Held until {new Date(tank.hold.plannedEndAt).toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" })}
          </span>
        ) : null}
        {tank.openIncidents.length ? (
          <Link href={`/incidents?tank=${tank.id}`} className="font-semibold text-bad hover:underline">
            {tank.openIncidents.length} open incident{tank.openIncidents.length > 1 ? "s" : ""}
          </Link>
        ) : null}
        {states.includes("stale") ? <span className="font-medium text-warn">No reading for over 2 min</span> : null}
      </footer>
    </article>
  );
}
