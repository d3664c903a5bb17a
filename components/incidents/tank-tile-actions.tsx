"use client";
// The actions at the foot of a tank tile: acknowledge its open incidents, place or release a hold.
import type { TankOverview } from "@/db/queries/overview";
import { HoldControl } from "@/components/holds/hold-control";
import { AcknowledgeButton } from "./acknowledge-button";

export function TankTileActions({ tank }: { tank: TankOverview }) {
  const open = tank.openIncidents.filter((i) => i.state === "open").map((i) => i.id);
  return (
    <span className="ml-auto inline-flex flex-wrap items-center gap-2">
      <AcknowledgeButton incidentIds={open} />
      <HoldControl tankId={tank.id} tankName={tank.name} hold={tank.hold} />
    </span>
  );
}
