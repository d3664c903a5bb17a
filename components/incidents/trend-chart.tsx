"use client";
// Incidents per day, one line per cause or tank (uPlot). Lines differ by dash pattern and point
// shape as well as by shade, and the legend names them, so colour is never the only cue.
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import { format } from "date-fns";
import "uplot/dist/uPlot.min.css";
import type { CountSeries } from "@/lib/alerts/stats";

const STROKES = ["#136659", "#1c1f1e", "#a45d00", "#4b5bb3", "#7b827f", "#b42318"];
const DASHES: number[][] = [[], [6, 4], [2, 3], [10, 3, 2, 3], [1, 2], [8, 8]];

export function TrendChart({ data, label, names, height = 200 }: { data: CountSeries; label: string; names: Record<string, string>; height?: number }) {
  const holder = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = holder.current;
    if (!el || data.series.length === 0) return;
    const opts: uPlot.Options = {
      width: el.clientWidth,
      height,
      scales: { x: { time: true }, y: { range: (_u, _min, max) => [0, Math.max(2, Math.ceil(max * 1.15))] } },
      axes: [
        { stroke: "#4a504e", grid: { stroke: "#ecebe6" }, values: (_u, ticks) => ticks.map((t) => format(t * 1000, "d MMM")) },
        { stroke: "#4a504e", grid: { stroke: "#ecebe6" }, incrs: [1, 2, 5, 10, 20, 50], values: (_u, ticks) => ticks.map((t) => String(t)), label: "incidents per day", labelSize: 18 },
      ],
      series: [
        { label: "Day", value: (_u: uPlot, v: number | null) => (v === null ? "—" : format(v * 1000, "d MMM yyyy")) },
        ...data.series.map((s, i) => ({
          label: names[s.key] ?? s.key,
          stroke: STROKES[i % STROKES.length],
          dash: DASHES[i % DASHES.length],
          width: 2,
          // A point marks only the days something happened, in a shape of its own per line.
          points: {
            show: true,
            size: 6 + (i % 3) * 2,
            fill: i % 2 ? "#ffffff" : STROKES[i % STROKES.length],
            filter: (_u: uPlot, seriesIdx: number) => data.series[seriesIdx - 1].counts.flatMap((c, j) => (c > 0 ? [j] : [])),
          },
          value: (_u: uPlot, v: number | null) => (v === null ? "—" : String(v)),
        })),
      ],
      legend: { live: true },
    };
    const aligned: uPlot.AlignedData = [data.starts.map((t) => t / 1000), ...data.series.map((s) => s.counts)];
    const plot = new uPlot(opts, aligned, el);
    const resize = new ResizeObserver(() => plot.setSize({ width: el.clientWidth, height }));
    resize.observe(el);
    return () => {
      resize.disconnect();
      plot.destroy();
    };
  }, [data, names, height]);
  return (
    <figure className="min-w-0">
      <figcaption className="mb-2 text-sm font-semibold">{label}</figcaption>
      {data.series.length === 0 ? <p className="text-sm text-ink-soft">No incidents in this range.</p> : <div ref={holder} className="w-full" role="img" aria-label={`${label}: ${data.series.map((s) => `${names[s.key] ?? s.key} ${s.total}`).join(", ")}`} />}
    </figure>
  );
}
