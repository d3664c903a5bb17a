"use client";
// A reusable uPlot 1.6 time-series chart of downsampled data: the mean per bucket as a line, the
// min–max envelope shaded around it, the target band drawn behind, holds shaded and calibrations
// marked on the time axis, and a hover readout with the bucket's quality flag.
import { useEffect, useRef, useState } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { format } from "date-fns";
import type { Buckets, Quality } from "@/lib/display/downsample";

export interface ChartMarkers {
  holds: { from: number; to: number; label: string }[];
  calibrations: { at: number; label: string; accepted: boolean }[];
}

export interface TimeSeriesChartProps {
  buckets: Buckets;
  from: number;
  to: number;
  /** Target band in display units. */
  band: [number, number] | null;
  label: string;
  unit: string;
  decimals: number;
  convert?: (v: number) => number;
  markers?: ChartMarkers;
  height?: number;
}

const QUALITY_LABEL: Record<Quality, string> = { ok: "ok", held: "held", uncalibrated: "uncalibrated", lapsed: "lapsed", suspect: "suspect" };
const COLOURS = { line: "#1c1f1e", envelope: "rgba(28,31,30,0.14)", band: "rgba(31,158,137,0.16)", bandEdge: "rgba(19,102,89,0.55)", hold: "rgba(75,91,179,0.13)", cal: "#136659", calRejected: "#b42318", grid: "#ecebe6", axis: "#4a504e" };

type Aligned = [number[], (number | null)[], (number | null)[], (number | null)[]];

/** Missing data longer than this (and than three buckets) breaks the line; shorter gaps are joined. */
const GAP_MS = 6 * 60_000;

/** uPlot wants seconds and nulls where data is missing, so a gap is not drawn across. */
function toAligned(b: Buckets, convert: (v: number) => number): { data: Aligned; index: number[] } {
  const gap = Math.max(3 * b.bucketMs, GAP_MS);
  const xs: number[] = [];
  const mean: (number | null)[] = [];
  const min: (number | null)[] = [];
  const max: (number | null)[] = [];
  const index: number[] = [];
  for (let i = 0; i < b.t.length; i++) {
    if (i > 0 && b.t[i] - b.t[i - 1] > gap) {
      xs.push((b.t[i - 1] + b.bucketMs) / 1000);
      mean.push(null);
      min.push(null);
      max.push(null);
      index.push(-1);
    }
    xs.push((b.t[i] + b.bucketMs / 2) / 1000);
    mean.push(convert(b.mean[i]));
    min.push(convert(b.min[i]));
    max.push(convert(b.max[i]));
    index.push(i);
  }
  return { data: [xs, mean, min, max], index };
}

/** 24-hour clock for a day or so, weekday and time for a week, day and month beyond. */
function timeLabels(u: uPlot, splits: number[]): string[] {
  const span = (u.scales.x.max ?? 0) - (u.scales.x.min ?? 0);
  const pattern = span <= 36 * 3600 ? "HH:mm" : span <= 8 * 86400 ? "EEE HH:mm" : "d MMM";
  return splits.map((s) => format(s * 1000, pattern));
}

interface Hover {
  at: number;
  mean: number;
  min: number;
  max: number;
  count: number;
  quality: Quality | null;
}

const identity = (v: number) => v;

export function TimeSeriesChart({ buckets, from, to, band, label, unit, decimals, convert = identity, markers, height = 220 }: TimeSeriesChartProps) {
  const holder = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  // Hooks read the newest props through this ref, so the chart is built once and only fed data.
  const live = useRef({ buckets, band, markers, from, to, convert, index: [] as number[] });
  const [hover, setHover] = useState<Hover | null>(null);

  useEffect(() => {
    const el = holder.current;
    if (!el) return;
    const drawBackdrop = (u: uPlot) => {
      const { ctx, bbox } = u;
      const { band: b, markers: m } = live.current;
      ctx.save();
      ctx.beginPath();
      ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
      ctx.clip();
      if (b) {
        const top = u.valToPos(b[1], "y", true);
        const bottom = u.valToPos(b[0], "y", true);
        ctx.fillStyle = COLOURS.band;
        ctx.fillRect(bbox.left, top, bbox.width, bottom - top);
        ctx.strokeStyle = COLOURS.bandEdge;
        ctx.setLineDash([4, 4]);
        ctx.lineWidth = 1;
        for (const y of [top, bottom]) {
          ctx.beginPath();
          ctx.moveTo(bbox.left, y);
          ctx.lineTo(bbox.left + bbox.width, y);
          ctx.stroke();
        }
        ctx.setLineDash([]);
      }
      for (const h of m?.holds ?? []) {
        const x0 = u.valToPos(h.from / 1000, "x", true);
        const x1 = u.valToPos(h.to / 1000, "x", true);
        ctx.fillStyle = COLOURS.hold;
        ctx.fillRect(x0, bbox.top, Math.max(2, x1 - x0), bbox.height);
      }
      for (const c of m?.calibrations ?? []) {
        const x = u.valToPos(c.at / 1000, "x", true);
        ctx.strokeStyle = c.accepted ? COLOURS.cal : COLOURS.calRejected;
        ctx.lineWidth = 2 * uPlot.pxRatio;
        ctx.setLineDash(c.accepted ? [] : [3 * uPlot.pxRatio, 3 * uPlot.pxRatio]);
        ctx.beginPath();
        ctx.moveTo(x, bbox.top);
        ctx.lineTo(x, bbox.top + bbox.height);
        ctx.stroke();
        // A triangle on the axis edge, so the marker has a shape and not only a colour.
        ctx.setLineDash([]);
        ctx.fillStyle = ctx.strokeStyle;
        ctx.beginPath();
        ctx.moveTo(x - 5 * uPlot.pxRatio, bbox.top);
        ctx.lineTo(x + 5 * uPlot.pxRatio, bbox.top);
        ctx.lineTo(x, bbox.top + 8 * uPlot.pxRatio);
        ctx.fill();
      }
      ctx.restore();
    };

    const opts: uPlot.Options = {
      width: el.clientWidth || 600,
      height,
      legend: { show: false },
      cursor: { drag: { x: false, y: false }, points: { size: 7 } },
      scales: {
        x: { time: true, range: () => [live.current.from / 1000, live.current.to / 1000] },
        y: {
          range: (_u, dataMin, dataMax) => {
            const b = live.current.band;
            const lo = Math.min(dataMin ?? Infinity, b ? b[0] : Infinity);
            const hi = Math.max(dataMax ?? -Infinity, b ? b[1] : -Infinity);
            if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [0, 1];
            const pad = (hi - lo) * 0.15 || Math.abs(hi) * 0.05 || 1;
            return [lo - pad, hi + pad];
          },
        },
      },
      axes: [
        { stroke: COLOURS.axis, grid: { stroke: COLOURS.grid }, ticks: { stroke: COLOURS.grid }, space: 72, values: timeLabels },
        { stroke: COLOURS.axis, grid: { stroke: COLOURS.grid }, ticks: { stroke: COLOURS.grid }, size: 56, values: (_u, splits) => splits.map((v) => v.toFixed(decimals)) },
      ],
      series: [
        {},
        { label, stroke: COLOURS.line, width: 1.75, points: { show: false } },
        { label: "min", stroke: "transparent", width: 0, points: { show: false } },
        { label: "max", stroke: "transparent", width: 0, points: { show: false } },
      ],
      bands: [{ series: [3, 2], fill: COLOURS.envelope }],
      hooks: {
        drawAxes: [drawBackdrop],
        setCursor: [
          (u) => {
            const i = u.cursor.idx;
            const source = i === null || i === undefined ? -1 : live.current.index[i];
            if (source === undefined || source < 0) return setHover(null);
            const b = live.current.buckets;
            const c = live.current.convert;
            setHover({ at: b.t[source], mean: c(b.mean[source]), min: c(b.min[source]), max: c(b.max[source]), count: b.count[source], quality: b.quality[source] });
          },
        ],
      },
    };
    const { data, index } = toAligned(live.current.buckets, live.current.convert);
    live.current.index = index;
    const u = new uPlot(opts, data as uPlot.AlignedData, el);
    plot.current = u;
    const resize = new ResizeObserver(() => u.setSize({ width: el.clientWidth, height }));
    resize.observe(el);
    return () => {
      resize.disconnect();
      u.destroy();
      plot.current = null;
    };
  }, [height, label, decimals]);

  useEffect(() => {
    live.current = { ...live.current, buckets, band, markers, from, to, convert };
    const u = plot.current;
    if (!u) return;
    const { data, index } = toAligned(buckets, convert);
    live.current.index = index;
    u.setData(data as uPlot.AlignedData);
  }, [buckets, band, markers, from, to, convert]);

  const fmt = (v: number) => v.toFixed(decimals);
  return (
    <figure className="min-w-0" data-chart={label}>
      <figcaption className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1 px-1 pb-1">
        <span className="font-semibold">
          {label} <span className="text-sm font-normal text-ink-faint">{unit}</span>
        </span>
        <span className="num min-h-5 text-sm text-ink-soft" aria-live="off" data-testid="chart-readout">
          {hover ? (
            <>
              {format(hover.at, "d MMM HH:mm:ss")} · <span className="font-semibold text-ink">{fmt(hover.mean)}</span>
              {hover.count > 1 ? ` (${fmt(hover.min)}–${fmt(hover.max)}, ${hover.count} readings)` : ""} ·{" "}
              {hover.quality ? <QualityWord quality={hover.quality} /> : <span className="text-ink-faint">per-minute summary</span>}
            </>
          ) : buckets.t.length ? (
            <span className="text-ink-faint">Hover or touch the chart for a reading</span>
          ) : (
            <span className="text-ink-faint">No readings in this range</span>
          )}
        </span>
      </figcaption>
      <div ref={holder} className="w-full" data-points={buckets.t.length} />
    </figure>
  );
}

function QualityWord({ quality }: { quality: Quality }) {
  const cls = quality === "ok" ? "text-ok" : quality === "held" ? "text-held" : "text-warn";
  return <span className={`font-semibold ${cls}`}>quality {QUALITY_LABEL[quality]}</span>;
}
