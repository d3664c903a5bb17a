"use client";
// The readings around an incident (two hours either side) on the shared uPlot chart, with the
// tank's holds and calibrations marked.
import { TimeSeriesChart, type ChartMarkers } from "@/components/charts/time-series-chart";
import { MEASURE_NAME } from "@/lib/display/labels";
import type { TankSeries } from "@/app/api/tanks/[id]/series/load-series";
import { ecDecimals, ecInUnit, ecUnitLabel, type EcUnit } from "@/lib/display/units";

type Kind = "ph" | "ec" | "temp";

export function IncidentChart({ data, kinds, ecUnit }: { data: TankSeries; kinds: Kind[]; ecUnit: EcUnit }) {
  const holds = data.holds.map((h) => ({ from: h.placedAt, to: h.endAt ?? Math.max(data.to, h.plannedEndAt), label: h.reason }));
  const markers = (kind: Kind): ChartMarkers => ({
    holds,
    calibrations: data.calibrations.filter((c) => c.kind === kind).map((c) => ({ at: c.at, label: c.status, accepted: c.status === "accepted" })),
  });
  const ec = (v: number) => ecInUnit(v, ecUnit);
  return (
    <div className="space-y-4" data-incident-chart>
      {kinds.map((kind) =>
        kind === "ec" ? (
          <TimeSeriesChart key={kind} label="EC" unit={ecUnitLabel(ecUnit)} decimals={ecDecimals(ecUnit)} buckets={data.series.ec} from={data.from} to={data.to} band={[ec(data.band.ec[0]), ec(data.band.ec[1])]} convert={ec} markers={markers(kind)} />
        ) : (
          <TimeSeriesChart key={kind} label={MEASURE_NAME[kind]} unit={kind === "temp" ? "°C" : ""} decimals={kind === "ph" ? 2 : 1} buckets={data.series[kind]} from={data.from} to={data.to} band={data.band[kind]} markers={markers(kind)} />
        ),
      )}
    </div>
  );
}
