// A calibration done elsewhere (a handheld meter, another technician's log) entered by hand:
// the results as recorded, the buffers with their lots, and optionally the certificate.
import { and, eq } from "drizzle-orm";
import type { Db } from "../client";
import { calibrationPoints, calibrationRuns, uploads } from "../schema";
import { EC_ACCEPTANCE, bufferPh, bufferTableProblem, ecStandardAt, judgePhCalibration, parseStandardText, type BufferSpec, type EcStandardSpec } from "../../lib/calibration";
import { unprocessable } from "../../app/_server/errors";
import { audit } from "./audit";
import { asUnprocessable, checkExpiry, type Actor } from "./calibration-runs";
import { probeInOrg } from "./calibration-scope";
import { recomputeFrom } from "../../ingest/recompute";

export interface ManualInput {
  probeId: number;
  performedAt: number;
  slopePct?: number;
  offsetMv?: number;
  cellConstant?: number;
  standards: { standard: string; lot: string; expiresOn: string; tempC?: number }[];
  note?: string;
  uploadId?: number;
}

export async function createManualCalibration(db: Db, user: Actor, input: ManualInput, now = Date.now()) {
  const { probe, tank } = await probeInOrg(db, user.orgId, input.probeId);
  if (probe.kind === "temp") throw unprocessable("Temperature probes are not calibrated in Tidewell.");
  if (input.performedAt > now) throw unprocessable("The calibration time is in the future.", { performedAt: "Enter when it was done" });
  if (input.performedAt < probe.installedAt) throw unprocessable("The calibration time is before the probe was installed.", { performedAt: "Check the date" });
  for (const s of input.standards) checkExpiry(s.expiresOn, input.performedAt);
  if (input.uploadId !== undefined) {
    const [up] = await db.select({ id: uploads.id }).from(uploads).where(and(eq(uploads.id, input.uploadId), eq(uploads.orgId, user.orgId)));
    if (!up) throw unprocessable("The attached certificate was not found; attach it again.", { uploadId: "Attach the file again" });
  }

  let verdict: "accepted" | "rejected";
  let reasons: string[];
  let deviationPct: number | null = null;
  if (probe.kind === "ph") {
    if (input.slopePct === undefined || input.offsetMv === undefined) throw unprocessable("Enter the slope (%) and offset (mV) from the meter's record.", { slopePct: "Required for a pH probe" });
    const j = judgePhCalibration(input.slopePct, input.offsetMv);
    verdict = j.verdict;
    reasons = j.verdict === "accepted" ? [`Slope ${input.slopePct.toFixed(1)} % and offset ${input.offsetMv.toFixed(1)} mV are within the limits (90–105 %, ±30 mV)`, ...j.advice] : j.reasons;
  } else {
    if (input.cellConstant === undefined) throw unprocessable("Enter the cell constant from the meter's record.", { cellConstant: "Required for an EC probe" });
    const nominal = probe.nominalCellConstant ?? 1;
    deviationPct = ((input.cellConstant - nominal) / nominal) * 100;
    verdict = Math.abs(deviationPct) <= EC_ACCEPTANCE.maxDeviationPct ? "accepted" : "rejected";
    const what = `Cell constant ${input.cellConstant.toPrecision(4)} /cm is ${Math.abs(deviationPct).toFixed(1)} % ${deviationPct >= 0 ? "above" : "below"} the nominal ${nominal} /cm (limit ±${EC_ACCEPTANCE.maxDeviationPct} %)`;
    reasons = [verdict === "accepted" ? what : `${what}: clean the probe and retry in fresh standard`];
  }
  const expected = input.standards.map((s, i) => {
    const t = s.tempC ?? 25;
    const spec = parseStandardText(s.standard);
    const tableProblem = probe.kind === "ph" ? bufferTableProblem(spec) : null;
    if (tableProblem) throw unprocessable(tableProblem, { [`standards.${i}.standard`]: tableProblem });
    return asUnprocessable(() => (probe.kind === "ph" ? bufferPh(spec as BufferSpec, t) : ecStandardAt(spec as EcStandardSpec, t)));
  });

  const run = await db.transaction(async (tx) => {
    const [run] = await tx
      .insert(calibrationRuns)
      .values({
        probeId: probe.id,
        tankId: tank.id,
        source: "manual",
        status: verdict,
        startedBy: user.id,
        startedAt: input.performedAt,
        completedAt: input.performedAt,
        effectiveAt: verdict === "accepted" ? input.performedAt : null,
        slopePct: probe.kind === "ph" ? input.slopePct : null,
        offsetMv: probe.kind === "ph" ? input.offsetMv : null,
        cellConstant: probe.kind === "ec" ? input.cellConstant : null,
        deviationPct,
        reasons,
        uploadId: input.uploadId ?? null,
        note: input.note?.trim() || null,
        plannedStandards: input.standards.map((s) => s.standard),
      })
      .returning();
    if (input.standards.length) {
      await tx.insert(calibrationPoints).values(
        input.standards.map((s, i) => ({
          runId: run.id,
          seq: i + 1,
          purpose: "point" as const,
          standard: s.standard,
          lot: s.lot,
          expiresOn: s.expiresOn,
          tempC: s.tempC ?? 25,
          tempSource: "typed" as const,
          expected: expected[i],
          capturedAt: input.performedAt,
        })),
      );
    }
    await audit(tx, { orgId: user.orgId, userId: user.id, action: "calibration.manual", entity: "calibration_run", entityId: run.id, detail: { probe: probe.serial, verdict }, at: now });
    return run;
  });
  // In force from a time in the past: the readings stored since then are corrected again.
  const recomputed = run.status === "accepted" ? await recomputeFrom(db, probe.id, input.performedAt) : null;
  return { run, recomputed };
}
