// Demo only: place the simulated probe in the current step's buffer or standard (or back in the
// tank), through the simulator's control topic, so a run can be done end to end.
import { z } from "zod";
import { getDb } from "@/db/client";
import { getRunView } from "@/db/queries/calibration-runs";
import { runInOrg } from "@/db/queries/calibration-scope";
import { ApiError, conflict, notFound, unprocessable } from "@/app/_server/errors";
import { CAN_CHANGE, guarded, idParam, parseBody } from "@/app/_server/guard";
import { publish } from "@/app/_server/mqtt";
import { ecStandardAt, parseStandardText, type EcStandardSpec } from "@/lib/calibration";
import { simControl, type SimControl } from "@/ingest/payloads";
import { topics } from "@/ingest/topics";

export const POST = guarded({ roles: CAN_CHANGE, action: "change calibrations", params: idParam }, async ({ user, params, req }) => {
  const db = getDb();
  const { run } = await runInOrg(db, user.orgId, params.id);
  if (process.env.TIDEWELL_DEMO !== "1") throw notFound("The simulator");
  const body = await parseBody(req, z.object({ placeIn: z.enum(["standard", "tank"]) }));
  // A finished run may only put the probe back in the tank; buffers belong to a run in progress.
  if (body.placeIn === "standard" && run.status !== "in_progress") throw conflict(`This calibration run is already ${run.status}; start a new run to place the probe in a buffer.`);
  const view = await getRunView(db, user.orgId, params.id);
  if (!view.tank.controllerId) throw unprocessable("This tank has no controller to simulate.");
  const step = view.progress.steps[view.progress.current];
  let placeIn: SimControl["placeIn"] = "tank";
  if (body.placeIn === "standard") {
    if (!step?.standard) throw unprocessable("This step does not use a buffer or standard.");
    const spec = parseStandardText(step.standard);
    if (view.probe.kind === "ph") {
      if (typeof spec !== "string") throw unprocessable("The simulator knows only the catalogue buffers.");
      placeIn = { kind: "ph-buffer", buffer: spec };
    } else {
      placeIn = { kind: "ec-standard", ec25UsPerCm: ecStandardAt(spec as EcStandardSpec, 25) };
    }
  }
  const message = simControl.parse({ v: 1, measure: view.probe.kind, placeIn });
  try {
    await publish(topics.simControl(view.tank.controllerId), JSON.stringify(message), { qos: 1, retain: false });
  } catch (err) {
    throw new ApiError(409, "simulator_unreachable", `The simulator could not be told (${err instanceof Error ? err.message : "broker unavailable"}).`);
  }
  return { ok: true, placeIn };
});
