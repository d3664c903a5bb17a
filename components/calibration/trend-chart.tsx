"use client";
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";

export interface TrendPoint {
  at: number;
  /** pH probes: slope % and offset mV; EC probes: cell constant (1/cm). */
  a: number;
  b?: number;
}

/** Slope and offset (or cell constant) of each accepted calibration over time. */
export function TrendChart({ points, kind }: { points: TrendPoint[]; kind: "ph" | "ec" }) {
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = ref.current;
    if (!el || points.length === 0) return;
    const xs = points.map((p) => p.at / 1000);
    const data: uPlot.AlignedData = kind === "ph" ? [xs, points.map((p) => p.a), points.map((p) => p.b ?? null)] : [xs, points.map((p) => p.a)];
    const series: uPlot.Series[] =
      kind === "ph"
        ? [
            {},
            { label: "Slope %", stroke: "#136659", width: 2, scale: "pct", points: { show: true, size: 7 }, value: (_u, v) => (v == null ? "—" : `${v.toFixed(1)} %`) },
            { label: "Offset mV", stroke: "#a45d00", width: 2, dash: [6, 4], scale: "mv", points: { show: true, size: 7 }, value: (_u, v) => (v == null ? "—" : `${v.toFixed(1)} mV`) },
          ]
        : [{}, { label: "Cell constant /cm", stroke: "#136659", width: 2, scale: "k", points: { show: true, size: 7 }, value: (_u, v) => (v == null ? "—" : v.toPrecision(4)) }];
    const axes: uPlot.Axis[] =
      kind === "ph"
        ? [{}, { scale: "pct", label: "Slope %", size: 56 }, { scale: "mv", label: "Offset mV", side: 1, size: 56, grid: { show: false } }]
        : [{}, { scale: "k", label: "Cell constant /cm", size: 64 }];
    const plot = new uPlot(
      {
        width: el.clientWidth,
        height: 240,
        series,
        axes,
        scales: kind === "ph" ? { x: { time: true }, pct: { range: [85, 108] }, mv: { range: [-35, 35] } } : { x: { time: true } },
        legend: { live: false },
      },
      data,
      el,
    );
    const resize = new ResizeObserver(() => plot.setSize({ width: el.clientWidth, height: 240 }));
    resize.observe(el);
    return () => {
      resize.disconnect();
      plot.destroy();
    };
  }, [points, kind]);
  if (points.length === 0) return <p className="text-sm text-ink-soft">No accepted calibrations to chart yet.</p>;
  return <div ref={ref} data-testid="trend-chart" className="w-full" role="img" aria-label={kind === "ph" ? "Slope and offset of each accepted calibration" : "Cell constant of each accepted calibration"} />;
}
