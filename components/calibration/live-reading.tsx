"use client";
import { useQuery } from "@tanstack/react-query";
import { Thermometer } from "lucide-react";
import { api } from "./api";
import { StabilityIndicator } from "./stability-indicator";
import type { LiveJson } from "./types";

/** Polls the probe's live reading every second (works whatever the live stream does). */
export function useLive(probeId: number) {
  return useQuery({
    queryKey: ["live", probeId],
    queryFn: () => api<LiveJson>(`/api/probes/${probeId}/live?since=${Date.now() - 60_000}`),
    refetchInterval: 1000,
    staleTime: 0,
  });
}

export function LiveReading({ live, kind, expectedLabel }: { live: LiveJson | undefined; kind: "ph" | "ec"; expectedLabel?: string }) {
  const latest = live?.latest ?? null;
  return (
    <section aria-label="Live reading" data-testid="live-reading" className="rounded-lg border border-paper-line bg-paper p-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Live raw signal</p>
          <p className="num text-4xl font-semibold" data-testid="live-raw">
            {latest ? (kind === "ph" ? latest.raw.toFixed(1) : latest.raw.toFixed(0)) : "—"}
            <span className="ml-1 text-lg font-normal text-ink-soft">{kind === "ph" ? "mV" : "µS"}</span>
          </p>
          <p className="num text-sm text-ink-soft">
            {latest?.value != null ? (kind === "ph" ? `reads pH ${latest.value.toFixed(2)}` : `reads ${(latest.value / 1000).toFixed(3)} mS/cm`) : "no corrected value"} with the calibration in force
            {expectedLabel ? <> · the buffer is {expectedLabel}</> : null}
          </p>
        </div>
        <p className="num flex items-center gap-1 text-sm text-ink-soft">
          <Thermometer className="size-4" aria-hidden />
          {live?.temperature ? `${live.temperature.value.toFixed(1)} °C from the tank's temperature probe` : "no tank temperature"}
        </p>
      </div>
      <div className="mt-3">
        <StabilityIndicator live={live} />
      </div>
    </section>
  );
}
