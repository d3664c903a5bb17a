"use client";
// Feeds the live stream into the TanStack Query cache: latest values on the tank queries, appended
// points on the series queries that follow now, and a refetch after events or a reconnect.
import { useQueryClient } from "@tanstack/react-query";
import { useLiveStream, type LiveEventName } from "./use-live-stream";
import type { OrgEvent } from "@/ingest/payloads";
import type { TankOverview } from "@/db/queries/overview";
import { withAppendedReadings, withLatestReadings } from "./live-cache";
import type { CachedSeries, TankScope } from "./queries";

export function useLiveBridge(scope: TankScope, since: number | null, onEvent?: (name: LiveEventName, event: OrgEvent) => void) {
  const client = useQueryClient();
  return useLiveStream(scope, since, {
    readings(tankId, readings) {
      client.setQueriesData<TankOverview[]>({ queryKey: ["tanks"] }, (old) => withLatestReadings(old, tankId, readings));
      client.setQueriesData<CachedSeries>({ queryKey: ["series", tankId] }, (old) => withAppendedReadings(old, readings));
    },
    event(name, event) {
      void client.invalidateQueries({ queryKey: ["tanks"] });
      // Holds and calibrations are marked on the charts' time axis.
      if (name !== "incident" && event.tankId !== null) void client.invalidateQueries({ queryKey: ["series", event.tankId] });
      onEvent?.(name, event);
    },
    resync(why) {
      void client.invalidateQueries({ queryKey: ["tanks"] });
      if (why === "truncated") void client.invalidateQueries({ queryKey: ["series"] });
    },
  });
}
