import { requestNow } from "@/app/_server/clock";
import type { Metadata } from "next";
import { getDb } from "@/db/client";
import { tankOverview } from "@/db/queries/overview";
import { currentUser } from "@/app/_server/session";
import { PageHeader } from "@/components/ui/card";
import { TankTile, toStateInput } from "@/components/tanks/tank-tile";
import { STATE_RANK, tankStates } from "@/lib/display/tank-state";

export const metadata: Metadata = { title: "Tank wall" };
export const dynamic = "force-dynamic";

export default async function TankWallPage() {
  const user = (await currentUser())!;
  const now = requestNow();
  const tanks = await tankOverview(getDb(), user.orgId, { now });
  const sorted = [...tanks].sort(
    (a, b) => STATE_RANK[tankStates(toStateInput(a, now))[0]] - STATE_RANK[tankStates(toStateInput(b, now))[0]] || a.name.localeCompare(b.name),
  );
  return (
    <>
      <PageHeader title="Tank wall" subtitle={`${tanks.length} tanks, worst first · readings corrected with the calibration in force`} />
      {tanks.length === 0 ? (
        <p className="text-ink-soft">No tanks yet. A grower or owner can add them in Settings.</p>
      ) : (
        <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3 2xl:grid-cols-4">
          {sorted.map((t) => (
            <TankTile key={t.id} tank={t} now={now} ecUnit={user.ecUnit} />
          ))}
        </div>
      )}
    </>
  );
}
