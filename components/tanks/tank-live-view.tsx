"use client";
// The live part of a tank's page: its tile and its charts, both fed by one stream narrowed to the tank.
import { useMemo } from "react";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import type { TankOverview } from "@/db/queries/overview";
import type { EcUnit } from "@/lib/display/units";
import { useLiveBridge } from "@/components/live/use-live-bridge";
import { LiveStatusBadge } from "@/components/live/live-status";
import { useNow } from "@/components/live/use-now";
import { keepNewerLatest } from "@/components/live/live-cache";
import { fetchTanks, tanksKey } from "@/components/live/queries";
import { TankTile } from "./tank-tile";
import { TankCharts } from "./tank-charts";

export function TankLiveView({ initialTank, ecUnit, renderedAt }: { initialTank: TankOverview; ecUnit: EcUnit; renderedAt: number }) {
  const client = useQueryClient();
  const scope = useMemo(() => ({ tank: initialTank.id }), [initialTank.id]);
  const now = useNow(renderedAt, 2_000);
  const { data } = useQuery({
    queryKey: tanksKey(scope),
    queryFn: async () => keepNewerLatest(await fetchTanks(scope), client.getQueryData(tanksKey(scope))),
    initialData: [initialTank],
    initialDataUpdatedAt: renderedAt,
    staleTime: 30_000,
    refetchInterval: 60_000,
  });
  const status = useLiveBridge(scope, renderedAt);
  const tank = data[0] ?? initialTank;
  return (
    <div className="space-y-6">
      <div className="flex justify-end">
        <LiveStatusBadge status={status} />
      </div>
      <TankTile tank={tank} now={now} ecUnit={ecUnit} />
      <TankCharts tankId={tank.id} ecUnit={ecUnit} renderedAt={renderedAt} />
    </div>
  );
}
