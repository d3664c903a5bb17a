// Guided runs, manual entries, spot checks and CSV import against a real, migrated temporary
// SQLite file. Readings are written with explicit timestamps (the probe's raw mV or µS as a
// device would publish them), so nothing waits on the wall clock.
import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { and, eq, inArray, isNull, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import * as schema from "@/db/schema";
import { abandonRun, capturePoint, completeRun, confirmStep, getRunView, startRun } from "@/db/queries/calibration-runs";
import { calibrationInForce } from "@/db/queries/calibration-scope";
import { createManualCalibration } from "@/db/queries/calibration-manual";
import { probeRecord } from "@/db/queries/calibration-history";
import { calibrationCompliance } from "@/db/queries/calibration-compliance";
import { addSpotCheck, deleteSpotCheck, editSpotCheck, importSpotChecksCsv, listSpotChecks } from "@/db/queries/spot-checks";
import { DAY_MS, bufferPh, ecStandardAt, nernstSlopeMv, phFromMv } from "@/lib/calibration";
import { refusal } from "./helpers/refusal";
import { useTestDatabase } from "./helpers/use-test-database";

const T0 = Date.UTC(2026, 11, 2, 10, 0);
const SEC = 1000;

let db: Db;
let user: { id: number; orgId: number };
let otherOrg: { id: number; orgId: number };
let tankId: number;
let ph: number;
let ec: number;
let temp: number;

/** A glass electrode's mV (DOMAIN.md section 1: E = E0 − s·k(T)·(pH − 7)). */
function electrodeMv(phValue: number, tempC: number, slopePct: number, offsetMv: number) {
  return offsetMv - (slopePct / 100) * nernstSlopeMv(tempC) * (phValue - 7);
}

/** Writes one raw sample per second for a probe, ending at `end` (inclusive). */
async function feed(probeId: number, end: number, seconds: number, raw: (ts: number) => number) {
  const rows = [];
  for (let ts = end - seconds * SEC; ts <= end; ts += SEC) rows.push({ probeId, ts, raw: raw(ts), value: null, quality: "held" as const });
  await db
    .insert(schema.readings)
    .values(rows)
    .onConflictDoUpdate({ target: [schema.readings.probeId, schema.readings.ts], set: { raw: sql`excluded.raw` } });
}

async function feedTemperature(end: number, tempC: number) {
  await db.insert(schema.readings).values({ probeId: temp, ts: end, raw: tempC, value: tempC, quality: "ok" }).onConflictDoNothing();
}

const testDb = useTestDatabase({ label: "cal", seed: false, per: "file" });

beforeAll(async () => {
  db = testDb.orm;
  const [org] = await db.insert(schema.organisations).values({ name: "Test Farm" }).returning();
  const [u] = await db.insert(schema.users).values({ orgId: org.id, email: "g@test.example", name: "Grower", role: "grower" }).returning();
  user = { id: u.id, orgId: org.id };
  const [org2] = await db.insert(schema.organisations).values({ name: "Other Farm" }).returning();
  const [u2] = await db.insert(schema.users).values({ orgId: org2.id, email: "o@other.example", name: "Other", role: "owner" }).returning();
  otherOrg = { id: u2.id, orgId: org2.id };
  const [site] = await db.insert(schema.sites).values({ orgId: org.id, name: "Site A" }).returning();
  const [tank] = await db
    .insert(schema.tanks)
    .values({ siteId: site.id, name: "T1", crop: "leafy greens", phMin: 5.5, phMax: 6.5, ecMinUs: 800, ecMaxUs: 1200, controllerId: "ctl-t1" })
    .returning();
  tankId = tank.id;
  const probeRows = await db
    .insert(schema.probes)
    .values([
      { tankId, kind: "ph", serial: "PH-1", installedAt: T0 - 100 * DAY_MS },
      { tankId, kind: "ec", serial: "EC-1", installedAt: T0 - 100 * DAY_MS, nominalCellConstant: 1.0 },
      { tankId, kind: "temp", serial: "TS-1", installedAt: T0 - 100 * DAY_MS },
    ])
    .returning();
  [ph, ec, temp] = probeRows.map((p) => p.id);
});

beforeEach(async () => {
  // Each test starts with the tank free of holds and runs in progress.
  await db.update(schema.holds).set({ releasedAt: T0 - 1, releaseKind: "manual" }).where(isNull(schema.holds.releasedAt));
  await db.update(schema.calibrationRuns).set({ status: "abandoned" }).where(eq(schema.calibrationRuns.status, "in_progress"));
});

/** Runs a guided pH run to its result with an electrode of the given slope and offset at 20 °C. */
async function phRun(at: number, electrode: { slopePct: number; offsetMv: number }, opts: { asFound?: boolean } = {}) {
  const { runId } = await startRun(db, user, { tankId, probeId: ph }, at);
  let t = at;
  let view = await getRunView(db, user.orgId, runId);
  if (view.progress.steps[view.progress.current].key === "as-found") {
    t += 60 * SEC;
    await feedTemperature(t, 20);
    await feed(ph, t, 35, () => electrodeMv(bufferPh("tech-7.00", 20), 20, electrode.slopePct, electrode.offsetMv));
    if (opts.asFound === false) await confirmStep(db, user, runId, "skip-as-found", t);
    else await capturePoint(db, user, runId, { purpose: "as_found", lot: "B7-1", expiresOn: "2027-09-30" }, t);
  }
  await confirmStep(db, user, runId, "clean", t);
  for (const buffer of ["tech-7.00", "tech-4.01"] as const) {
    t += 60 * SEC;
    await feedTemperature(t, 20);
    await feed(ph, t, 35, () => electrodeMv(bufferPh(buffer, 20), 20, electrode.slopePct, electrode.offsetMv));
    await capturePoint(db, user, runId, { purpose: "point", lot: `L-${buffer}`, expiresOn: "2027-09-30" }, t);
  }
  view = await getRunView(db, user.orgId, runId);
  return { runId, view, t };
}

/** Skips the as-found check and confirms cleaning, so the run's next step is its first point. */
async function passPreparation(runId: number, at: number) {
  await confirmStep(db, user, runId, "skip-as-found", at);
  await confirmStep(db, user, runId, "clean", at);
}

/** Starts a guided pH run at `at` on the calibrated pH probe and brings it to its first point. */
async function runReadyForPoints(at: number): Promise<number> {
  const { runId } = await startRun(db, user, { tankId, probeId: ph }, at);
  await passPreparation(runId, at);
  return runId;
}

describe("guided pH run", () => {
  it("puts the tank on hold, walks the steps and fits slope and offset", async () => {
    const { runId } = await startRun(db, user, { tankId, probeId: ph }, T0);
    const [hold] = await db.select().from(schema.holds).where(and(eq(schema.holds.tankId, tankId), isNull(schema.holds.releasedAt)));
    expect(hold.reason).toBe("Calibration run");
    expect(hold.plannedEndAt - hold.placedAt).toBe(30 * 60_000);
    // Starting again resumes the run in progress.
    expect((await startRun(db, user, { tankId, probeId: ph }, T0 + SEC)).runId).toBe(runId);

    let view = await getRunView(db, user.orgId, runId);
    // Never calibrated: nothing to check as found, so the run starts at cleaning.
    expect(view.progress.steps.map((s) => s.key)).toEqual(["clean", "point", "point", "result"]);
    expect(view.progress.steps[1].standard).toBe("tech-7.00"); // neutral first by default
    await confirmStep(db, user, runId, "clean", T0 + 10 * SEC);

    const t1 = T0 + 60 * SEC;
    await feedTemperature(t1, 20);
    await feed(ph, t1, 35, () => electrodeMv(bufferPh("tech-7.00", 20), 20, 98, -5));
    const p1 = await capturePoint(db, user, runId, { purpose: "point", lot: "B7-2611", expiresOn: "2027-09-30" }, t1);
    // Commercial 7.00 buffer at 20 °C is 7.02 (DOMAIN.md section 2, typical maker table, from memory).
    expect(p1.expected).toBeCloseTo(7.02, 6);
    expect(p1.tempSource).toBe("probe");
    expect(p1.stable).toBe(true);

    const t2 = T0 + 120 * SEC;
    await feed(ph, t2, 35, () => electrodeMv(bufferPh("tech-4.01", 21.5), 21.5, 98, -5));
    await capturePoint(db, user, runId, { purpose: "point", lot: "B4-2611", expiresOn: "2027-09-30", tempC: 21.5 }, t2);

    view = await getRunView(db, user.orgId, runId);
    expect(view.progress.steps[view.progress.current].key).toBe("result");
    expect(view.preview && "slopePct" in view.preview ? view.preview.slopePct : NaN).toBeCloseTo(98, 6); // DOMAIN.md section 1, two-point formulas
    const saved = await completeRun(db, user, runId, {}, T0 + 130 * SEC);
    expect(saved.run.status).toBe("accepted");
    expect(saved.run.slopePct).toBeCloseTo(98, 6);
    expect(saved.run.offsetMv).toBeCloseTo(-5, 6);
    expect(saved.run.effectiveAt).toBe(T0 + 130 * SEC);
    expect((await calibrationInForce(db, ph, T0 + 131 * SEC))?.id).toBe(runId);
    expect(await calibrationInForce(db, ph, T0 + 129 * SEC)).toBeNull();
  });

  it("records the as-found error of the calibration in force before adjusting", async () => {
    const at = T0 + 5 * DAY_MS;
    // The electrode drifted to offset −2 mV; the calibration in force says −5 mV.
    const { view } = await phRun(at, { slopePct: 98, offsetMv: -2 });
    expect(view.progress.steps[0].key).toBe("as-found");
    const expectedError = (-5 - -2) / (0.98 * nernstSlopeMv(20)); // pH = 7 + (E0 − E)/(s·k) minus the buffer pH
    expect(view.run.asFoundErrorPh).toBeCloseTo(expectedError, 6);
    await completeRun(db, user, view.run.id, {}, at + 10 * 60 * SEC);
    const record = await probeRecord(db, user.orgId, ph, at + DAY_MS);
    expect(record.status).toBe("current");
    expect(record.drift?.checks).toBe(1);
    expect(record.drift!.ratePerDay!).toBeCloseTo(Math.abs(expectedError) / ((at + 60 * SEC - (T0 + 130 * SEC)) / DAY_MS), 6);
    expect(record.drift!.suggestedDueAt).toBeLessThanOrEqual(record.dueAt!);
  });

  it("refuses an expired buffer with the reason", async () => {
    const at = T0 + 6 * DAY_MS;
    const runId = await runReadyForPoints(at);
    await feedTemperature(at + 60 * SEC, 20);
    await feed(ph, at + 60 * SEC, 35, () => 0);
    const err = await refusal(capturePoint(db, user, runId, { purpose: "point", lot: "OLD", expiresOn: "2026-11-30" }, at + 60 * SEC));
    expect(err.status).toBe(422);
    expect(err.message).toMatch(/expired on 2026-11-30/);
    expect(err.fields?.expiresOn).toBeDefined();
    const missingLot = await refusal(capturePoint(db, user, runId, { purpose: "point" }, at + 60 * SEC));
    expect(Object.keys(missingLot.fields ?? {})).toEqual(["lot", "expiresOn"]);
  });

  it("captures an unsettled reading only with a note", async () => {
    const at = T0 + 7 * DAY_MS;
    const runId = await runReadyForPoints(at);
    const t = at + 60 * SEC;
    await feedTemperature(t, 20);
    await feed(ph, t, 35, (ts) => (ts - t) / 1000); // drifting 1 mV a second
    const err = await refusal(capturePoint(db, user, runId, { purpose: "point", lot: "A", expiresOn: "2027-01-01" }, t));
    expect(err.status).toBe(422);
    expect(err.message).toMatch(/not settled/);
    const point = await capturePoint(db, user, runId, { purpose: "point", lot: "A", expiresOn: "2027-01-01", note: "Probe slow to settle; captured as is" }, t);
    expect(point.stable).toBe(false);
    expect(point.note).toMatch(/slow to settle/);
    await abandonRun(db, user, runId, t);
  });

  it("refuses a capture with no live reading, and a point out of step order", async () => {
    const at = T0 + 8 * DAY_MS;
    const { runId } = await startRun(db, user, { tankId, probeId: ph }, at);
    const outOfOrder = await refusal(capturePoint(db, user, runId, { purpose: "point", lot: "A", expiresOn: "2027-01-01" }, at));
    expect(outOfOrder.status).toBe(409);
    await passPreparation(runId, at);
    const stale = await refusal(capturePoint(db, user, runId, { purpose: "point", lot: "A", expiresOn: "2027-01-01", tempC: 20 }, at + 10 * 60 * SEC));
    expect(stale.message).toMatch(/No reading from the probe/);
    await abandonRun(db, user, runId, at);
  });

  it("judges a point kept offline as of when capture was pressed, and saves a resent key once", async () => {
    const at = T0 + 8.5 * DAY_MS;
    const runId = await runReadyForPoints(at);
    const pressed = at + 60 * SEC;
    await feedTemperature(pressed, 20);
    await feed(ph, pressed, 35, () => electrodeMv(bufferPh("tech-7.00", 20), 20, 98, 2));
    const key = "6f1c2b9e-8a47-4c1d-9e3f-2b7a5d0c4e81";
    const body = { purpose: "point" as const, lot: "B7-OFF", expiresOn: "2027-09-30", readingTs: pressed, clientKey: key };
    // Ten minutes offline: judged now, the reading would be stale; judged when pressed, it is live and stable.
    const stale = await refusal(capturePoint(db, user, runId, { ...body, clientKey: undefined }, pressed + 10 * 60 * SEC));
    expect(stale.message).toMatch(/No reading from the probe/);
    const point = await capturePoint(db, user, runId, { ...body, queuedMs: 10 * 60 * SEC }, pressed + 10 * 60 * SEC);
    expect(point.capturedAt).toBe(pressed);
    expect(point.stable).toBe(true);
    // The answer was lost and the phone sends it again: the same point, nothing new.
    const again = await capturePoint(db, user, runId, { ...body, queuedMs: 12 * 60 * SEC }, pressed + 12 * 60 * SEC);
    expect(again.id).toBe(point.id);
    const rows = await db.select().from(schema.calibrationPoints).where(eq(schema.calibrationPoints.runId, runId));
    expect(rows).toHaveLength(1);
    // A point claimed to be pressed before the run started is refused.
    const early = await refusal(capturePoint(db, user, runId, { ...body, clientKey: "0b8e6f7a-3c2d-4e5f-8a9b-1c2d3e4f5a6b", queuedMs: 2 * 60 * SEC }, pressed));
    expect(early.status).toBe(422);
    await abandonRun(db, user, runId, pressed);
  });

  it("marks the probe for replacement after a second rejection in a row", async () => {
    const at = T0 + 10 * DAY_MS;
    const first = await phRun(at, { slopePct: 86, offsetMv: -5 }, { asFound: false });
    expect(first.view.preview && "verdict" in first.view.preview ? first.view.preview.verdict : null).toBe("rejected");
    const r1 = await completeRun(db, user, first.runId, {}, first.t);
    expect(r1.run.status).toBe("rejected");
    expect(r1.run.reasons.join(" ")).toMatch(/below the 90 % minimum/); // acceptance: common practice (DOMAIN.md section 1)
    expect(r1.probeMarkedForReplacement).toBe(false);
    expect(r1.run.effectiveAt).toBeNull();

    const second = await phRun(first.t + 60 * 60 * SEC, { slopePct: 87, offsetMv: -5 }, { asFound: false });
    expect(second.view.previousRejected).toBe(true);
    const r2 = await completeRun(db, user, second.runId, {}, second.t);
    expect(r2.probeMarkedForReplacement).toBe(true);
    const [probe] = await db.select().from(schema.probes).where(eq(schema.probes.id, ph));
    expect(probe.status).toBe("replace");

    // A later accepted calibration puts it back in service.
    const third = await phRun(second.t + 60 * 60 * SEC, { slopePct: 99, offsetMv: -3 }, { asFound: false });
    expect((await completeRun(db, user, third.runId, {}, third.t)).run.status).toBe("accepted");
    const [after] = await db.select().from(schema.probes).where(eq(schema.probes.id, ph));
    expect(after.status).toBe("active");
  });

  it("takes a typed effective time for a run entered late, and corrects the readings stored since", async () => {
    const at = T0 + 13 * DAY_MS;
    for (const ts of [at - 60 * 60 * SEC, at - 30 * 60 * SEC]) {
      await feedTemperature(ts, 20);
      await db.insert(schema.readings).values({ probeId: ph, ts, raw: 12, value: 6.5, quality: "ok" });
    }
    const { runId, t } = await phRun(at, { slopePct: 97, offsetMv: 2 }, { asFound: false });
    const future = await refusal(completeRun(db, user, runId, { effectiveAt: t + 60 * SEC }, t));
    expect(future.status).toBe(422);
    expect(future.fields).toMatchObject({ effectiveAt: "Not in the future: enter when the run was done" });
    const beforePrevious = await refusal(completeRun(db, user, runId, { effectiveAt: T0 + 10 * DAY_MS }, t));
    expect(beforePrevious.status).toBe(422);
    expect(beforePrevious.fields?.effectiveAt).toMatch(/^After the previous accepted calibration \(/);

    const effectiveAt = at - 45 * 60 * SEC;
    const saved = await completeRun(db, user, runId, { effectiveAt }, t);
    expect(saved.run).toMatchObject({ status: "accepted", effectiveAt, completedAt: t });
    expect(saved.recomputed?.updated).toBeGreaterThan(0);
    const rows = await db.select().from(schema.readings).where(and(eq(schema.readings.probeId, ph), inArray(schema.readings.ts, [at - 60 * 60 * SEC, at - 30 * 60 * SEC]))).orderBy(schema.readings.ts);
    expect(rows[0].calibrationRunId).not.toBe(runId); // before the effective time: the calibration then in force
    expect(rows[1].calibrationRunId).toBe(runId);
    expect(rows[1].value).toBeCloseTo(phFromMv(12, 20, { slopePct: saved.run.slopePct!, offsetMv: saved.run.offsetMv! }), 9);
    const [entry] = await db.select().from(schema.auditLog).where(and(eq(schema.auditLog.entity, "calibration_run"), eq(schema.auditLog.entityId, runId), eq(schema.auditLog.action, "calibration.save")));
    expect(entry.detail).toMatchObject({ verdict: "accepted", effectiveAt: new Date(effectiveAt).toISOString() });
  });

  it("keeps other organisations out", async () => {
    const { runId } = await startRun(db, user, { tankId, probeId: ph }, T0 + 12 * DAY_MS);
    expect((await refusal(getRunView(db, otherOrg.orgId, runId))).status).toBe(404);
    expect((await refusal(startRun(db, otherOrg, { tankId, probeId: ph }))).status).toBe(404);
    expect((await refusal(capturePoint(db, otherOrg, runId, { purpose: "point" }))).status).toBe(404);
  });
});

describe("guided EC run", () => {
  it("computes the cell constant from the standard and judges it against nominal", async () => {
    const at = T0 + 14 * DAY_MS;
    const { runId } = await startRun(db, user, { tankId, probeId: ec }, at);
    const view = await getRunView(db, user.orgId, runId);
    expect(view.progress.steps.map((s) => s.key)).toEqual(["clean", "point", "result"]);
    await confirmStep(db, user, runId, "clean", at);
    const t = at + 60 * SEC;
    await feedTemperature(t, 25);
    // 0.01 mol/L KCl: 1413 µS/cm at 25 °C (OIML R 56); a cell of K = 0.98 /cm reads 1413/0.98 µS.
    await feed(ec, t, 35, () => 1413 / 0.98);
    const point = await capturePoint(db, user, runId, { purpose: "point", lot: "K1413-1", expiresOn: "2027-04-30" }, t);
    expect(point.expected).toBeCloseTo(ecStandardAt("kcl-0.01M", 25), 9);
    const saved = await completeRun(db, user, runId, {}, t);
    expect(saved.run.status).toBe("accepted");
    expect(saved.run.cellConstant).toBeCloseTo(0.98, 9);
    expect(saved.run.deviationPct).toBeCloseTo(-2, 9);
  });
});

describe("manual calibration entries", () => {
  it("records a calibration done elsewhere, effective at its own time", async () => {
    const performedAt = T0 + 15 * DAY_MS;
    // Readings stored before the entry was made, corrected with the calibration then in force.
    for (const ts of [performedAt + 60 * SEC, performedAt + 120 * SEC]) {
      await feedTemperature(ts, 20);
      await db.insert(schema.readings).values({ probeId: ph, ts, raw: 12, value: 6.5, quality: "ok" });
    }
    const { run, recomputed } = await createManualCalibration(
      db,
      user,
      { probeId: ph, performedAt, slopePct: 97.2, offsetMv: 4.1, standards: [{ standard: "tech-7.00", lot: "M7", expiresOn: "2027-03-01", tempC: 20 }], note: "Handheld meter, J. Park" },
      performedAt + DAY_MS,
    );
    expect(run.source).toBe("manual");
    expect(recomputed).not.toBeNull();
    expect(run.status).toBe("accepted");
    expect(run.effectiveAt).toBe(performedAt);
    expect((await calibrationInForce(db, ph, performedAt + SEC))?.id).toBe(run.id);
    const after = await db.select().from(schema.readings).where(and(eq(schema.readings.probeId, ph), eq(schema.readings.ts, performedAt + 60 * SEC)));
    expect(after[0].calibrationRunId).toBe(run.id);
    expect(after[0].value).toBeCloseTo(phFromMv(12, 20, { slopePct: 97.2, offsetMv: 4.1 }), 9);
  });

  it("refuses a buffer already expired when the calibration was done", async () => {
    const err = await refusal(
      createManualCalibration(db, user, { probeId: ph, performedAt: T0, slopePct: 99, offsetMv: 0, standards: [{ standard: "tech-7.00", lot: "X", expiresOn: "2026-12-01" }] }, T0 + DAY_MS),
    );
    expect(err.status).toBe(422);
    expect(err.message).toMatch(/expired/);
  });

  it("refuses a certificate table that is not plausible, naming the row and the field", async () => {
    const backwards = JSON.stringify({ points: [[25, 7.0], [20, 7.02]] });
    const manual = await refusal(
      createManualCalibration(db, user, { probeId: ph, performedAt: T0 + 15 * DAY_MS, slopePct: 99, offsetMv: 0, standards: [{ standard: backwards, lot: "C1", expiresOn: "2027-06-01", tempC: 22 }] }, T0 + 15 * DAY_MS),
    );
    expect(manual.status).toBe(422);
    expect(manual.message).toBe("Row 2 of the buffer table: Temperatures must go up row by row: 20 °C comes after 25 °C");
    expect(manual.fields).toEqual({ "standards.0.standard": manual.message });
    const guided = await refusal(startRun(db, user, { tankId, probeId: ph, standards: ["tech-7.00", JSON.stringify({ points: [[20, 4.0], [25, 41]] })] }, T0 + 15 * DAY_MS));
    expect(guided.status).toBe(422);
    expect(guided.fields).toEqual({ "standards.1": "Row 2 of the buffer table: Between pH 0 and 14; check the certificate" });
    expect(await db.select().from(schema.calibrationRuns).where(eq(schema.calibrationRuns.status, "in_progress"))).toEqual([]);
  });

  it("rejects a cell constant more than 10 % from nominal", async () => {
    const { run } = await createManualCalibration(db, user, { probeId: ec, performedAt: T0 + 16 * DAY_MS, cellConstant: 1.15, standards: [{ standard: "kcl-0.01M", lot: "K", expiresOn: "2027-04-30" }] }, T0 + 16 * DAY_MS);
    expect(run.status).toBe("rejected"); // ±10 % of nominal, common practice (DOMAIN.md section 3)
    expect(run.effectiveAt).toBeNull();
  });
});

describe("spot checks", () => {
  const at = T0 + 20 * DAY_MS;
  beforeAll(async () => {
    await db.insert(schema.readings).values([
      { probeId: ph, ts: at - 3 * 60 * SEC, raw: 0, value: 5.5, quality: "ok" },
      { probeId: ph, ts: at - 50 * SEC, raw: 0, value: 6.0, quality: "ok" },
      { probeId: ph, ts: at + 70 * SEC, raw: 0, value: 6.4, quality: "ok" },
      { probeId: ec, ts: at, raw: 0, value: 1000, quality: "ok" },
    ]);
  });

  it("compares with the nearest corrected reading within ±2 min and flags a difference past tolerance", async () => {
    const within = await addSpotCheck(db, user, { probeId: ph, takenAt: at, meterValue: 6.05 }, at);
    expect(within.spotCheck.tidewellValue).toBe(6.0);
    expect(within.spotCheck.difference).toBeCloseTo(0.05, 9);
    expect(within.spotCheck.pastTolerance).toBe(false);
    const past = await addSpotCheck(db, user, { probeId: ph, takenAt: at, meterValue: 6.25 }, at);
    expect(past.spotCheck.pastTolerance).toBe(true); // the tank's default tolerance is 0.1 pH
    const none = await addSpotCheck(db, user, { probeId: ph, takenAt: at + 10 * 60 * SEC, meterValue: 6 }, at + 10 * 60 * SEC);
    expect(none.spotCheck.tidewellValue).toBeNull();
    expect(none.spotCheck.pastTolerance).toBe(false);
    expect((await listSpotChecks(db, user.orgId, ph)).rows.length).toBe(3);
  });

  it("imports a CSV in one transaction: all rows, or none when any row is wrong", async () => {
    const before = (await listSpotChecks(db, user.orgId, ec)).rows.length;
    const bad = [
      "probe,taken_at,value,unit,note",
      `EC-1,${new Date(at).toISOString()},1.05,mS/cm,ok row`,
      `NOPE-9,${new Date(at).toISOString()},6.1,,`,
      `PH-1,yesterday,6.1,,`,
      `PH-1,${new Date(at).toISOString()},abc,,`,
    ].join("\n");
    const err = await refusal(importSpotChecksCsv(db, user, bad, at));
    expect(err.status).toBe(422);
    expect(Object.keys(err.fields ?? {})).toEqual(["row 3", "row 4", "row 5"]);
    expect(err.fields?.["row 3"]).toMatch(/No probe with serial NOPE-9/);
    expect((await listSpotChecks(db, user.orgId, ec)).rows.length).toBe(before);

    const good = ["probe,taken_at,value,unit", `EC-1,${new Date(at).toISOString()},1.05,mS/cm`, `EC-1,${new Date(at).toISOString().slice(0, 16)},1250,µS/cm`].join("\n");
    const result = await importSpotChecksCsv(db, user, good, at);
    expect(result).toEqual({ imported: 2, pastTolerance: 1 }); // 1050 vs 1000 is within 100 µS/cm; 1250 is not
    expect((await listSpotChecks(db, user.orgId, ec)).rows.length).toBe(before + 2);
  });

  it("edits a spot check (compared again) and deletes one, each with an audit entry; other farms get 404", async () => {
    const added = await addSpotCheck(db, user, { probeId: ph, takenAt: at, meterValue: 6.3, note: "typo" }, at);
    expect(added.spotCheck.pastTolerance).toBe(true);
    const edited = await editSpotCheck(db, user, added.spotCheck.id, { takenAt: at + 70 * SEC, meterValue: 6.35, note: "meter 2" }, at + DAY_MS);
    expect(edited.spotCheck).toMatchObject({ id: added.spotCheck.id, tidewellValue: 6.4, pastTolerance: false, note: "meter 2" });
    expect(edited.spotCheck.difference).toBeCloseTo(-0.05, 9);
    expect((await refusal(editSpotCheck(db, user, added.spotCheck.id, { takenAt: at, meterValue: 15 }, at))).fields).toEqual({ meterValue: "A pH reading must be between 0 and 14" });
    expect((await refusal(editSpotCheck(db, otherOrg, added.spotCheck.id, { takenAt: at, meterValue: 6 }, at))).status).toBe(404);
    expect((await refusal(deleteSpotCheck(db, otherOrg, added.spotCheck.id, at))).status).toBe(404);

    await deleteSpotCheck(db, user, added.spotCheck.id, at + 2 * DAY_MS);
    expect((await listSpotChecks(db, user.orgId, ph)).rows.map((r) => r.id)).not.toContain(added.spotCheck.id);
    expect((await refusal(deleteSpotCheck(db, user, added.spotCheck.id, at))).status).toBe(404);
    const trail = await db.select().from(schema.auditLog).where(and(eq(schema.auditLog.entity, "spot_check"), eq(schema.auditLog.entityId, added.spotCheck.id))).orderBy(schema.auditLog.id);
    expect(trail.map((a) => [a.action, a.userId])).toEqual([["spot-check.add", user.id], ["spot-check.edit", user.id], ["spot-check.delete", user.id]]);
    expect(trail[1].detail).toMatchObject({ before: { meterValue: 6.3, note: "typo" }, after: { meterValue: 6.35, note: "meter 2" } });
    expect(trail[2].detail).toMatchObject({ deleted: { meterValue: 6.35 } });
  });

  it("refuses serials of another organisation as unknown", async () => {
    const err = await refusal(importSpotChecksCsv(db, otherOrg, `probe,taken_at,value\nPH-1,${new Date(at).toISOString()},6`, at));
    expect(err.fields?.["row 2"]).toMatch(/No probe with serial PH-1/);
  });
});

describe("compliance", () => {
  it("counts probes in date, overdue probes and runs per month per site", async () => {
    const [site] = await calibrationCompliance(db, user.orgId, T0 + 21 * DAY_MS);
    expect(site.probes).toBe(2);
    expect(site.inDate).toBe(2);
    expect(site.overdue).toEqual([]);
    expect(site.perMonth.reduce((a, m) => a + m.accepted + m.rejected, 0)).toBeGreaterThan(0);
    expect(site.rejected.length).toBeGreaterThanOrEqual(2);
  });
});
