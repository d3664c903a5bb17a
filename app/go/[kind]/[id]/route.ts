// Where a scanned label lands. Signed out: sign-in, which returns here. Signed in: the tank's page,
// or for a probe the calibration run in progress on it (resumed on whichever phone scanned it),
// else a new run with the probe chosen; night managers follow runs and see the probe's record.
import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { calibrationRuns } from "@/db/schema";
import { currentUser } from "@/app/_server/session";
import { probeInOrg } from "@/db/queries/calibration-scope";
import { ApiError } from "@/app/_server/errors";
import { labelParams, labelPath } from "@/lib/labels/links";

export async function GET(_req: Request, ctx: { params: Promise<{ kind: string; id: string }> }): Promise<Response> {
  const parsed = labelParams.safeParse(await ctx.params);
  // A relative Location: behind a proxy (or on 127.0.0.1 vs localhost) req.url's host is not the
  // one the phone used, and a redirect to another host would lose the session cookie.
  const to = (path: string) => new Response(null, { status: 303, headers: { location: path, "cache-control": "no-store" } });
  if (!parsed.success) return to("/");
  const { kind, id } = parsed.data;
  const user = await currentUser();
  if (!user) return to(`/sign-in?next=${encodeURIComponent(labelPath(kind, id))}`);
  if (kind === "tank") return to(`/tanks/${id}`);

  const db = getDb();
  const scope = await probeInOrg(db, user.orgId, id).catch((e: unknown) => {
    if (e instanceof ApiError && e.status === 404) return null;
    throw e;
  });
  if (!scope) return to("/calibrations");
  const { probe, tank } = scope;
  if (probe.kind === "temp" || probe.status === "retired") return to(`/probes/${probe.id}`);
  const [open] = await db
    .select({ id: calibrationRuns.id })
    .from(calibrationRuns)
    .where(and(eq(calibrationRuns.probeId, probe.id), eq(calibrationRuns.status, "in_progress")))
    .orderBy(desc(calibrationRuns.startedAt))
    .limit(1);
  if (open) return to(`/calibrations/runs/${open.id}`);
  if (user.role === "night_manager") return to(`/probes/${probe.id}`);
  return to(`/calibrations/new?tank=${tank.id}&probe=${probe.id}`);
}
