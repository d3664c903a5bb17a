import { requestNow } from "@/app/_server/clock";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import type { ProbeOption } from "@/components/calibration/probe-options";

/** Every pH and EC probe in service in the organisation, by tank, for the entry forms. */
export async function probeOptions(orgId: number): Promise<ProbeOption[]> {
  const tanks = await tankOverview(getDb(), orgId, { now: requestNow() });
  return tanks.flatMap((t) =>
    t.probes.filter((p): p is typeof p & { kind: "ph" | "ec" } => p.kind !== "temp").map((p) => ({ id: p.id, kind: p.kind, serial: p.serial, tankName: t.name })),
  );
}
