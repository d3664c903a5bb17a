// Where a scanned label lands. Signed out: sign-in, which returns here. Signed in: the tank's page,
// or for a probe the calibration run in progress on it (resumed on whichever phone scanned it),
// else a new run with the probe chosen; night managers follow runs and see the probe's record.
// A page (not a route handler) so that its redirect also works inside the client router, which is
// how the sign-in form's return to this address arrives.
import { redirect } from "next/navigation";
import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { calibrationRuns } from "@/db/schema";
import { currentUser } from "@/app/_server/session";
import { probeInOrg } from "@/db/queries/calibration-scope";
import { ApiError } from "@/app/_server/errors";
import { labelParams, labelPath } from "@/lib/labels/links";

export const dynamic = "force-dynamic";

export default async function LabelLanding({ params }: { params: Promise<{ kind: string; id: string }> }): Promise<never> {
  return redirect(await landing(await params));
}

async function landing(raw: { kind: string; id: string }): Promise<string> {
  const parsed = labelParams.safeParse(raw);
  if (!parsed.success) return "/";
  const { kind, id } = parsed.data;
  const user = await currentUser();
  if (!user) return `/sign-in?next=${encodeURIComponent(labelPath(kind, id))}`;
  if (kind === "tank") return `/tanks/${id}`;

  const db = getDb();
  const scope = await probeInOrg(db, user.orgId, id).catch((e: unknown) => {
    if (e instanceof ApiError && e.status === 404) return null;
    throw e;
  });
  if (!scope) return "/calibrations";
  const { probe, tank } = scope;
  if (probe.kind === "temp" || probe.status === "retired") return `/probes/${probe.id}`;
  const [open] = await db
    .select({ id: calibrationRuns.id })
    .from(calibrationRuns)
    .where(and(eq(calibrationRuns.probeId, probe.id), eq(calibrationRuns.status, "in_progress")))
    .orderBy(desc(calibrationRuns.startedAt))
    .limit(1);
  if (open) return `/calibrations/runs/${open.id}`;
  if (user.role === "night_manager") return `/probes/${probe.id}`;
  return `/calibrations/new?tank=${tank.id}&probe=${probe.id}`;
}
