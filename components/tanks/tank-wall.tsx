"use client";
// The tank wall: every tank at once, worst first, kept current by the live stream through the
// TanStack Query cache. `?display=wall` turns it into a full-screen wall display.
import { useEffect, useMemo, useState } from "react";
import Link from "next/link";
import { useQueries, useQuery, useQueryClient } from "@tanstack/react-query";
import { toast } from "sonner";
import { Bell, BellOff, Expand, Minimize, MonitorUp, X } from "lucide-react";
import type { TankOverview } from "@/db/queries/overview";
import type { EcUnit } from "@/lib/display/units";
import { STATE_RANK, tankStates } from "@/lib/display/tank-state";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { useLiveBridge } from "@/components/live/use-live-bridge";
import { LiveStatusBadge } from "@/components/live/live-status";
import { useNow } from "@/components/live/use-now";
import { beep, unlockAudio } from "@/components/live/beep";
import { keepNewerLatest } from "@/components/live/live-cache";
import { SPARK_POINTS, SPARK_WINDOW_MS, fetchSeries, fetchTanks, seriesKey, tanksKey, type CachedSeries } from "@/components/live/queries";
import { TankTile, toStateInput } from "./tank-tile";

export interface TankWallProps {
  initialTanks: TankOverview[];
  initialSparks: Record<number, CachedSeries>;
  renderedAt: number;
  ecUnit: EcUnit;
  wallSound: boolean;
  display: "wall" | null;
  site?: number;
  saveWallSound: (on: boolean) => Promise<unknown>;
}

export function TankWall({ initialTanks, initialSparks, renderedAt, ecUnit, wallSound, display, site, saveWallSound }: TankWallProps) {
  const client = useQueryClient();
  const scope = useMemo(() => ({ site }), [site]);
  const now = useNow(renderedAt, 2_000);
  const [soundOn, setSoundOn] = useState(wallSound);
  const wall = display === "wall";

  const { data: tanks } = useQuery({
    queryKey: tanksKey(scope),
    queryFn: async () => keepNewerLatest(await fetchTanks(scope), client.getQueryData(tanksKey(scope))),
    initialData: initialTanks,
    initialDataUpdatedAt: renderedAt,
    staleTime: 30_000,
    refetchInterval: 60_000,
  });

  const sparks = useQueries({
    queries: tanks.map((t) => ({
      queryKey: seriesKey(t.id, "spark"),
      queryFn: () => fetchSeries(t.id, Date.now() - SPARK_WINDOW_MS, Date.now(), SPARK_POINTS, SPARK_WINDOW_MS),
      initialData: initialSparks[t.id],
      initialDataUpdatedAt: renderedAt,
      staleTime: Infinity,
    })),
  });
  const sparkByTank = new Map(tanks.map((t, i) => [t.id, sparks[i]?.data]));

  const status = useLiveBridge(scope, renderedAt, (name, event) => {
    if (name !== "incident" || event.type !== "incident.opened") return;
    const tank = tanks.find((t) => t.id === event.tankId);
    toast.error(`${tank?.name ?? "A tank"}: ${event.summary}`, { duration: 15_000 });
    if (soundOn) beep();
  });

  // Browsers start audio only after a gesture: the first click or key press on the wall unlocks it.
  useEffect(() => {
    if (!soundOn) return;
    const unlock = () => unlockAudio();
    window.addEventListener("pointerdown", unlock, { once: true });
    window.addEventListener("keydown", unlock, { once: true });
    return () => {
      window.removeEventListener("pointerdown", unlock);
      window.removeEventListener("keydown", unlock);
    };
  }, [soundOn]);

  const sorted = useMemo(() => {
    const ranked = tanks.map((t) => ({ t, rank: STATE_RANK[tankStates(toStateInput(t, now))[0]] }));
    return ranked.sort((a, b) => a.rank - b.rank || a.t.name.localeCompare(b.t.name)).map((r) => r.t);
  }, [tanks, now]);

  const toggleSound = async () => {
    const next = !soundOn;
    if (next) {
      unlockAudio();
      beep();
    }
    setSoundOn(next);
    try {
      await saveWallSound(next);
    } catch {
      toast.error("The sound setting could not be saved; it applies to this screen only.");
    }
  };

  const header = (
    <div className={cn("mb-5 flex flex-wrap items-center justify-between gap-3", wall && "mb-6")}>
      <div>
        <h1 className={cn("font-semibold tracking-tight", wall ? "text-4xl" : "text-2xl")}>Tank wall</h1>
        <p className={cn("mt-1 text-ink-soft", wall ? "text-lg" : "text-sm")}>
          {tanks.length} tanks, worst first · readings corrected with the calibration in force
        </p>
      </div>
      <div className="flex flex-wrap items-center gap-2">
        {wall ? <WallClock now={now} /> : null}
        <LiveStatusBadge status={status} large={wall} />
        <Button variant="secondary" size={wall ? "lg" : "md"} onClick={toggleSound} aria-pressed={soundOn} title="A short chime when a new incident opens">
          {soundOn ? <Bell className="size-4" aria-hidden /> : <BellOff className="size-4" aria-hidden />}
          {soundOn ? "Sound on" : "Sound off"}
        </Button>
        {wall ? (
          <>
            <FullscreenButton />
            <Link href={site ? `/?site=${site}` : "/"} className="inline-flex h-12 items-center gap-2 rounded-md border border-paper-line bg-paper-raised px-5 text-base font-medium hover:bg-paper-sunk">
              <X className="size-4" aria-hidden /> Leave wall display
            </Link>
          </>
        ) : (
          <Link
            href={`/?display=wall${site ? `&site=${site}` : ""}`}
            className="inline-flex h-10 items-center gap-2 rounded-md border border-paper-line bg-paper-raised px-4 text-sm font-medium hover:bg-paper-sunk"
          >
            <MonitorUp className="size-4" aria-hidden /> Wall display
          </Link>
        )}
      </div>
    </div>
  );

  const body =
    tanks.length === 0 ? (
      <p className="text-ink-soft">No tanks yet. A grower or owner can add them in Settings.</p>
    ) : (
      <div
        data-testid="tank-wall"
        className={cn("grid gap-4", wall ? "grid-cols-[repeat(auto-fill,minmax(min(100%,26rem),1fr))] gap-5" : "grid-cols-1 sm:grid-cols-2 xl:grid-cols-3 2xl:grid-cols-4")}
      >
        {sorted.map((t) => (
          <TankTile key={t.id} tank={t} now={now} ecUnit={ecUnit} wall={wall} spark={sparkByTank.get(t.id)} />
        ))}
      </div>
    );

  if (!wall) {
    return (
      <>
        {header}
        {body}
      </>
    );
  }
  // The wall display covers the app's navigation; everything needed at a distance stays.
  return (
    <div data-display="wall" className="fixed inset-0 z-50 overflow-auto bg-paper p-6 text-lg">
      {header}
      {body}
      <p className="mt-6 text-sm text-ink-faint">Alerts are an aid, not a substitute for walking the tanks.</p>
    </div>
  );
}

function WallClock({ now }: { now: number }) {
  const d = new Date(now);
  return (
    <span className="num mr-2 text-3xl font-semibold" suppressHydrationWarning>
      {String(d.getHours()).padStart(2, "0")}:{String(d.getMinutes()).padStart(2, "0")}
    </span>
  );
}

function FullscreenButton() {
  const [full, setFull] = useState(false);
  useEffect(() => {
    const sync = () => setFull(document.fullscreenElement !== null);
    document.addEventListener("fullscreenchange", sync);
    return () => document.removeEventListener("fullscreenchange", sync);
  }, []);
  const toggle = () => {
    if (document.fullscreenElement) void document.exitFullscreen();
    else void document.documentElement.requestFullscreen?.().catch(() => toast.error("This browser refused full screen."));
  };
  return (
    <Button variant="secondary" size="lg" onClick={toggle}>
      {full ? <Minimize className="size-4" aria-hidden /> : <Expand className="size-4" aria-hidden />}
      {full ? "Exit full screen" : "Full screen"}
    </Button>
  );
}
