"use client";
// Incidents per day as stacked bars (uPlot), split by cause or, with the toggle, by tank. Each
// segment has its own shade and, for every other series, a hatch, and the legend below names them
// with their totals; pointing at a day lists that day's counts. Colour is never the only cue.
import { useEffect, useMemo, useRef, useState } from "react";
import uPlot from "uplot";
import { format } from "date-fns";
import "uplot/dist/uPlot.min.css";
import { stackedTops, type CountSeries } from "@/lib/alerts/stats";
import { cn } from "@/components/ui/cn";

// Calm shades of the palette; red is kept for "bad" elsewhere, so no series uses it. The summed
// "other" series is always grey.
const FILLS = ["#136659", "#a45d00", "#4b5bb3", "#1f9e89", "#6b4c9a", "#8a6d3b"];
const OTHER_FILL = "#9aa19e";
const isOther = (key: string) => key === "other" || key === "other tanks";
const DAY_S = 86_400;

/** Shade and texture of series i: solid for even series, diagonal hatching for odd ones. */
function look(data: CountSeries, i: number): { colour: string; hatched: boolean } {
  return { colour: isOther(data.series[i].key) ? OTHER_FILL : FILLS[i % FILLS.length], hatched: i % 2 === 1 };
}

/** A canvas fill for a series' bars: its shade, or diagonal hatching on a light tint of it. */
function fillFor(ctx: CanvasRenderingContext2D, { colour, hatched }: { colour: string; hatched: boolean }): string | CanvasPattern {
  if (!hatched) return colour;
  const tile = document.createElement("canvas");
  const ratio = Math.max(1, Math.round(window.devicePixelRatio || 1));
  tile.width = tile.height = 8 * ratio;
  const t = tile.getContext("2d")!;
  t.scale(ratio, ratio);
  t.fillStyle = "#ffffff";
  t.fillRect(0, 0, 8, 8);
  t.globalAlpha = 0.25;
  t.fillStyle = colour;
  t.fillRect(0, 0, 8, 8);
  t.globalAlpha = 1;
  t.strokeStyle = colour;
  t.lineWidth = 2;
  t.beginPath();
  t.moveTo(-2, 10);
  t.lineTo(10, -2);
  t.moveTo(-2, 2);
  t.lineTo(2, -2);
  t.moveTo(6, 10);
  t.lineTo(10, 6);
  t.stroke();
  return ctx.createPattern(tile, "repeat") ?? colour;
}

/** The legend's swatch for a series, drawn like its bars. */
function Swatch({ colour, hatched }: { colour: string; hatched: boolean }) {
  return (
    <svg viewBox="0 0 12 12" className="size-3.5 shrink-0" aria-hidden>
      {!hatched ? (
        <rect width="12" height="12" rx="2" fill={colour} />
      ) : (
        <>
          <rect width="12" height="12" rx="2" fill={colour} fillOpacity={0.25} stroke={colour} strokeWidth={1.5} />
          <path d="M-1 9 L9 -1 M3 13 L13 3" stroke={colour} strokeWidth={1.8} />
        </>
      )}
    </svg>
  );
}

function StackedBars({ data, names, height, onHover }: { data: CountSeries; names: Record<string, string>; height: number; onHover: (index: number | null) => void }) {
  const holder = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = holder.current;
    if (!el) return;
    const tops = stackedTops(data);
    const maxTotal = Math.max(0, ...(tops[tops.length - 1] ?? []).map((v) => v ?? 0));
    const xs = data.starts.map((t) => t / 1000);
    const bars = uPlot.paths.bars!({ size: [0.72, 48], gap: 1 });
    // uPlot draws series in order: the tallest segment tops first, each lower one painted over it.
    const order = data.series.map((_, i) => i).reverse();
    const opts: uPlot.Options = {
      width: el.clientWidth,
      height,
      legend: { show: false },
      cursor: { y: false, points: { show: false }, drag: { x: false, y: false } },
      scales: {
        x: { time: true, range: () => [xs[0] - DAY_S / 2, xs[xs.length - 1] + DAY_S / 2] },
        y: { range: () => [0, Math.max(2, Math.ceil(maxTotal * 1.15))] },
      },
      axes: [
        { stroke: "#4a504e", grid: { show: false }, ticks: { stroke: "#dcdad3" }, values: (_u, ticks) => ticks.map((t) => format(t * 1000, "d MMM")) },
        { stroke: "#4a504e", grid: { stroke: "#ecebe6" }, incrs: [1, 2, 5, 10, 20, 50, 100], values: (_u, ticks) => ticks.map((t) => String(t)), label: "incidents per day", labelSize: 18, size: 40 },
      ],
      series: [
        {},
        ...order.map((i) => ({
          label: names[data.series[i].key] ?? data.series[i].key,
          fill: (u: uPlot) => fillFor(u.ctx, look(data, i)),
          stroke: look(data, i).colour,
          width: 1,
          paths: bars,
          points: { show: false },
        })),
      ],
      hooks: { setCursor: [(u) => onHover(u.cursor.idx ?? null)] },
    };
    const plot = new uPlot(opts, [xs, ...order.map((i) => tops[i])] as uPlot.AlignedData, el);
    const resize = new ResizeObserver(() => plot.setSize({ width: el.clientWidth, height }));
    resize.observe(el);
    return () => {
      resize.disconnect();
      plot.destroy();
    };
  }, [data, names, height, onHover]);
  return <div ref={holder} className="w-full" />;
}

type Split = "cause" | "tank";

export function IncidentTrends({ byCause, byTank, causeNames, height = 220 }: { byCause: CountSeries; byTank: CountSeries; causeNames: Record<string, string>; height?: number }) {
  const [split, setSplit] = useState<Split>("cause");
  const [hover, setHover] = useState<number | null>(null);
  const data = split === "cause" ? byCause : byTank;
  const names = useMemo((): Record<string, string> => (split === "cause" ? { ...causeNames, other: "Other causes" } : { "other tanks": "Other tanks" }), [split, causeNames]);
  const name = (key: string) => names[key] ?? key;
  const total = data.series.reduce((sum, s) => sum + s.total, 0);
  const days = data.starts.length;
  const day = hover === null ? null : data.starts[hover];
  const dayTotal = hover === null ? 0 : data.series.reduce((sum, s) => sum + s.counts[hover], 0);
  const summary = data.series.map((s) => `${name(s.key)} ${s.total}`).join(", ");

  return (
    <figure className="min-w-0" data-incident-trends={split}>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <figcaption className="text-sm font-semibold">
          Incidents per day, by {split}
          <span className="ml-2 font-normal text-ink-soft">
            {total} over {days} {days === 1 ? "day" : "days"}
          </span>
        </figcaption>
        <div role="group" aria-label="Split the bars" className="inline-flex rounded-md border border-paper-line bg-paper-sunk p-0.5 text-sm">
          {(["cause", "tank"] as const).map((s) => (
            <button
              key={s}
              type="button"
              aria-pressed={split === s}
              onClick={() => {
                setSplit(s);
                setHover(null);
              }}
              className={cn("rounded px-3 py-1 font-medium", split === s ? "bg-paper-raised text-ink shadow-sm ring-1 ring-paper-line" : "text-ink-soft hover:text-ink")}
            >
              By {s}
            </button>
          ))}
        </div>
      </div>
      {data.series.length === 0 ? (
        <p className="text-sm text-ink-soft">No incidents in this range.</p>
      ) : (
        <>
          <p className="num mb-1 h-5 text-xs text-ink-soft" aria-live="polite" data-trend-readout>
            {day === null ? (
              "Point at a day for its counts."
            ) : (
              <>
                <span className="font-semibold text-ink">{format(day, "EEE d MMM")}</span> ·{" "}
                {dayTotal === 0
                  ? "no incidents"
                  : data.series
                      .filter((s) => s.counts[hover!] > 0)
                      .map((s) => `${name(s.key)} ${s.counts[hover!]}`)
                      .join(" · ")}
              </>
            )}
          </p>
          <div role="img" aria-label={`Incidents per day by ${split}, stacked: ${summary}`}>
            <StackedBars key={split} data={data} names={names} height={height} onHover={setHover} />
          </div>
          <ul className="mt-3 flex flex-wrap gap-x-4 gap-y-1.5 text-sm" data-trend-legend>
            {data.series.map((s, i) => (
              <li key={s.key} className={cn("flex items-center gap-1.5", hover !== null && s.counts[hover] === 0 && "opacity-40")}>
                <Swatch {...look(data, i)} />
                <span>{name(s.key)}</span>
                <span className="num text-ink-soft">{hover === null ? s.total : s.counts[hover]}</span>
              </li>
            ))}
          </ul>
        </>
      )}
    </figure>
  );
}
