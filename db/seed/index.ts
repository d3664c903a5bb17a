// Deterministic demo seed: the scenario in ./scenario, 30 days of history at five-minute steps.
import fs from "node:fs";
import path from "node:path";
import bcrypt from "bcryptjs";
import { count } from "drizzle-orm";
import type { Client, InStatement } from "@libsql/client";
import type { Db } from "../client";
import * as s from "../schema";
import { bufferPh, ecFromConductance, ecStandardAt, fitEc, fitPh, phFromMv } from "../../lib/calibration";
import {
  DAY_MS,
  agedElectrode,
  cellConductanceUs,
  electrodeMv,
  rng,
  smoothNoise,
  solutionTempC,
  type Electrode,
} from "../../scripts/simulator/model";
import { CROP_PRESETS } from "../../lib/settings/crop-presets";
import { DEMO_ORG, DEMO_PASSWORD, DEMO_SITES, DEMO_USERS, PAST_INCIDENTS, type TankSpec } from "./scenario";

const STEP_MS = 5 * 60_000;
const HISTORY_DAYS = 30;
const MIN = 60_000;

export interface DeviceCredential {
  controllerId: string;
  username: string;
  password: string;
  tankId: number;
}

/** Seeds the demo when the database has no organisation yet. Returns whether it seeded. */
export async function seedIfEmpty(db: Db, client: Client, opts: { now?: number; credentialsFile?: string } = {}) {
  const [{ n }] = await db.select({ n: count() }).from(s.organisations);
  if (n > 0) return false;
  await seed(db, client, opts.now ?? Date.now(), opts.credentialsFile);
  return true;
}

/** True pH, EC25 (µS/cm) and temperature of a tank's solution at a time. */
export function tankTruth(tankIndex: number, spec: TankSpec, t: number, now: number) {
  const band = { ...CROP_PRESETS[spec.crop], ...spec.band };
  const seed = 1000 + tankIndex * 17;
  const phMid = (band.phMin + band.phMax) / 2;
  // pH creeps up as plants take up nitrate; the controller doses acid every ~4 h (sawtooth).
  const dosePeriod = (3.6 + tankIndex * 0.17) * 3_600_000;
  const phase = ((t + tankIndex * 1_234_567) % dosePeriod) / dosePeriod;
  let ph = phMid - 0.12 + 0.24 * phase + 0.02 * smoothNoise(seed, t, 5_400_000);
  // EC rises as water evaporates, then the morning top-up brings it back.
  const ecMid = (band.ecMinUs + band.ecMaxUs) / 2;
  const dayPhase = ((t + 18 * 3_600_000) % DAY_MS) / DAY_MS;
  let ec = ecMid - 90 + 160 * dayPhase + 15 * smoothNoise(seed + 1, t, 7_200_000);
  const temp = solutionTempC(seed + 2, t, 19.5 + (tankIndex % 3) * 0.4);
  for (const inc of PAST_INCIDENTS) {
    if (inc.tank !== spec.key || inc.disturbance === undefined) continue;
    const start = incidentStart(now, inc);
    if (t >= start && t <= start + (inc.resolveAfterMin + inc.ackAfterMin) * MIN) {
      if (inc.measure === "ph") ph += inc.disturbance;
      if (inc.measure === "ec") ec += inc.disturbance;
    }
  }
  return { ph, ecUs: ec, tempC: temp };
}

/** When a past incident opened: its day (counted back from now) at its UTC hour. */
function incidentStart(now: number, inc: { daysAgo: number; hour: number }) {
  return atHour(now - inc.daysAgo * DAY_MS, inc.hour);
}

async function seed(db: Db, client: Client, now: number, credentialsFile?: string) {
  const random = rng(42);
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  const credentials: DeviceCredential[] = [];
  const readingRows: string[] = [];
  const rollupRows: string[] = [];

  await db.transaction(async (tx) => {
    const [org] = await tx.insert(s.organisations).values({ name: DEMO_ORG }).returning();
    const userIds: Record<string, number> = {};
    for (const u of DEMO_USERS) {
      const [row] = await tx
        .insert(s.users)
        .values({ ...u, orgId: org.id, passwordHash })
        .returning();
      userIds[u.role] = row.id;
    }

    let tankIndex = 0;
    for (const siteSpec of DEMO_SITES) {
      const [site] = await tx
        .insert(s.sites)
        .values({ orgId: org.id, name: siteSpec.name, timeZone: siteSpec.timeZone })
        .returning();
      for (const zoneSpec of siteSpec.zones) {
        const [zone] = await tx.insert(s.zones).values({ siteId: site.id, name: zoneSpec.name }).returning();
        for (const spec of zoneSpec.tanks) {
          const band = { ...CROP_PRESETS[spec.crop], ...spec.band };
          const [tank] = await tx
            .insert(s.tanks)
            .values({ siteId: site.id, zoneId: zone.id, name: spec.name, crop: spec.crop, controllerId: spec.controllerId, ...band })
            .returning();
          const idx = tankIndex++;
          const serialNo = String(101 + idx).padStart(4, "0");
          const installedAt =
            spec.calibration.kind === "never" ? now - spec.calibration.installedDaysAgo * DAY_MS : now - 200 * DAY_MS;
          const [ph] = await tx
            .insert(s.probes)
            .values({ tankId: tank.id, kind: "ph", serial: `PH-24-${serialNo}`, installedAt })
            .returning();
          const [ec] = await tx
            .insert(s.probes)
            .values({ tankId: tank.id, kind: "ec", serial: `EC-24-${serialNo}`, installedAt: now - 200 * DAY_MS, nominalCellConstant: 1.0 })
            .returning();
          const [temp] = await tx
            .insert(s.probes)
            .values({ tankId: tank.id, kind: "temp", serial: `TS-24-${serialNo}`, installedAt: now - 200 * DAY_MS })
            .returning();

          const password = `demo-${spec.controllerId}-${Math.floor(random() * 1e9).toString(36)}`;
          await tx.insert(s.devices).values({
            orgId: org.id,
            tankId: tank.id,
            controllerId: spec.controllerId,
            username: spec.controllerId,
            secretHash: await bcrypt.hash(password, 8),
          });
          credentials.push({ controllerId: spec.controllerId, username: spec.controllerId, password, tankId: tank.id });

          // Calibration record: when the probes were last cleaned and calibrated.
          const story = spec.calibration;
          const lastDaysAgo = story.kind === "never" ? null : story.daysAgo;
          const electrodeBase: Electrode = { offsetMv: -8 + random() * 14, slopePct: 99.2 - random() * 1.5 };
          const cellK = 0.96 + random() * 0.07;
          const cleanings = lastDaysAgo === null ? [] : [lastDaysAgo + 31, lastDaysAgo].filter((d) => d <= 200);
          const phRuns: { effectiveAt: number; slopePct: number; offsetMv: number; id: number }[] = [];
          const ecRuns: { effectiveAt: number; cellConstant: number; id: number }[] = [];
          let previousCleaning: number | null = null;

          for (const daysAgo of cleanings) {
            const at = atHour(now - daysAgo * DAY_MS, 10 + (idx % 3));
            const holdPlaced = at - 10 * MIN;
            const [hold] = await tx
              .insert(s.holds)
              .values({
                tankId: tank.id,
                reason: "Monthly probe cleaning and calibration",
                placedBy: userIds.grower,
                placedAt: holdPlaced,
                plannedEndAt: holdPlaced + 30 * MIN,
                releasedAt: holdPlaced + 26 * MIN,
                releasedBy: userIds.grower,
                releaseKind: "manual",
              })
              .returning();
            await audit(tx, org.id, userIds.grower, holdPlaced, "hold.place", "hold", hold.id, { tank: spec.name, minutes: 30 });
            await audit(tx, org.id, userIds.grower, holdPlaced + 26 * MIN, "hold.release", "hold", hold.id, { tank: spec.name });

            const electrodeNow = previousCleaning === null ? agedElectrode(electrodeBase, 30) : agedElectrode(electrodeBase, previousCleaning - daysAgo);
            const tempC = 20.6 + random() * 1.2;
            const asFoundPh = previousCleaning === null ? null : phFromMv(electrodeMv(bufferPh("tech-7.00", tempC), tempC, electrodeNow), tempC, phRuns[phRuns.length - 1]);
            const fresh = electrodeBase; // cleaning restores the electrode
            const rejectedFirst = story.kind === "rejected-then-accepted" && daysAgo === story.daysAgo;
            if (rejectedFirst) {
              const fouled: Electrode = { offsetMv: fresh.offsetMv + 6, slopePct: 86.1 };
              await insertPhRun(tx, { probeId: ph.id, tankId: tank.id, userId: userIds.grower, at: at - 40 * MIN, tempC, electrode: fouled, holdId: hold.id, asFoundPh: null });
            }
            const run = await insertPhRun(tx, { probeId: ph.id, tankId: tank.id, userId: userIds.grower, at, tempC, electrode: fresh, holdId: hold.id, asFoundPh });
            phRuns.push(run);
            const ecRun = await insertEcRun(tx, { probeId: ec.id, tankId: tank.id, userId: userIds.grower, at: at + 8 * MIN, tempC, cellK, holdId: hold.id });
            ecRuns.push(ecRun);
            await audit(tx, org.id, userIds.grower, at, "calibration.save", "calibration_run", run.id, { probe: ph.serial, verdict: "accepted" });
            previousCleaning = daysAgo;
          }

          // Readings every five minutes for thirty days, corrected with the calibration in force.
          const from = Math.ceil((now - HISTORY_DAYS * DAY_MS) / STEP_MS) * STEP_MS;
          const heldWindows = await tx.query.holds.findMany({ where: (h, { eq }) => eq(h.tankId, tank.id) });
          for (let t = from; t < now; t += STEP_MS) {
            const truth = tankTruth(idx, spec, t, now);
            const held = heldWindows.some((h) => t >= h.placedAt && t <= (h.releasedAt ?? h.plannedEndAt));
            // pH
            if (t >= ph.installedAt) {
              const lastClean = [...cleanings].map((d) => now - d * DAY_MS).filter((c) => c <= t).pop();
              const daysSince = lastClean === undefined ? 30 : (t - lastClean) / DAY_MS;
              const mv = electrodeMv(truth.ph, truth.tempC, agedElectrode(electrodeBase, daysSince)) + (random() - 0.5) * 0.4;
              const cal = [...phRuns].reverse().find((r) => r.effectiveAt <= t);
              const value = phFromMv(mv, truth.tempC, cal ?? { slopePct: 100, offsetMv: 0 });
              const quality = held ? "held" : !cal ? "uncalibrated" : t - cal.effectiveAt > 30 * DAY_MS ? "lapsed" : "ok";
              pushReading(readingRows, rollupRows, ph.id, t, mv, value, quality, cal?.id);
            }
            // EC
            const g = cellConductanceUs(truth.ecUs / 1000, truth.tempC, cellK, 0.019) * (1 + (random() - 0.5) * 0.004);
            const ecCal = [...ecRuns].reverse().find((r) => r.effectiveAt <= t);
            const ecValue = ecFromConductance(g, truth.tempC, { cellConstant: ecCal?.cellConstant ?? 1, alphaPerC: 0.019 });
            const ecQuality = held ? "held" : !ecCal ? "uncalibrated" : t - ecCal.effectiveAt > 30 * DAY_MS ? "lapsed" : "ok";
            const staleGap = PAST_INCIDENTS.find((p) => p.tank === spec.key && p.cause === "stale");
            const inGap = staleGap && t >= incidentStart(now, staleGap) - 4 * MIN && t <= incidentStart(now, staleGap) + staleGap.resolveAfterMin * MIN;
            if (!inGap) pushReading(readingRows, rollupRows, ec.id, t, g, ecValue, ecQuality, ecCal?.id);
            // Temperature
            const tc = truth.tempC + (random() - 0.5) * 0.05;
            if (!inGap) pushReading(readingRows, rollupRows, temp.id, t, tc, tc, held ? "held" : "ok", undefined);
          }

          // Past incidents on this tank, each with its timeline.
          for (const inc of PAST_INCIDENTS.filter((p) => p.tank === spec.key)) {
            const openedAt = incidentStart(now, inc);
            const ackAt = openedAt + inc.ackAfterMin * MIN;
            const resolvedAt = ackAt + inc.resolveAfterMin * MIN;
            const probeId = inc.measure === "ph" ? ph.id : inc.measure === "ec" ? ec.id : inc.measure === "temp" ? temp.id : null;
            const [incident] = await tx
              .insert(s.incidents)
              .values({
                orgId: org.id,
                siteId: site.id,
                tankId: tank.id,
                probeId,
                cause: inc.cause,
                measure: inc.measure,
                severity: inc.cause === "out-of-band" ? "critical" : "warning",
                state: "resolved",
                message: inc.message,
                openedAt,
                acknowledgedAt: ackAt,
                acknowledgedBy: userIds[inc.ackBy],
                clearedAt: resolvedAt - 5 * MIN,
                resolvedAt,
                resolvedBy: inc.resolvedBy === "auto" ? null : userIds[inc.resolvedBy],
              })
              .returning();
            const onShift = inc.hour >= 7 && inc.hour < 19 ? "grower" : "night_manager";
            const onShiftUser = DEMO_USERS.find((u) => u.role === onShift)!;
            const events: (typeof s.incidentEvents.$inferInsert)[] = [
              { incidentId: incident.id, at: openedAt, kind: "opened", detail: inc.message },
              { incidentId: incident.id, at: openedAt + 4000, kind: "notified", detail: `E-mail to ${onShiftUser.name} (${onShift.replace("_", " ")}, on shift)` },
              { incidentId: incident.id, at: ackAt, kind: "acknowledged", userId: userIds[inc.ackBy] },
            ];
            if (inc.note) events.push({ incidentId: incident.id, at: ackAt + 2 * MIN, kind: "note", userId: userIds[inc.ackBy], detail: inc.note });
            events.push({ incidentId: incident.id, at: resolvedAt - 5 * MIN, kind: "cleared", detail: "Condition cleared" });
            events.push({
              incidentId: incident.id,
              at: resolvedAt,
              kind: "resolved",
              userId: inc.resolvedBy === "auto" ? null : userIds[inc.resolvedBy],
              detail: inc.resolvedBy === "auto" ? "Resolved automatically after staying clear" : null,
            });
            await tx.insert(s.incidentEvents).values(events);
            await tx.insert(s.notifications).values({
              orgId: org.id,
              incidentId: incident.id,
              userId: userIds[onShift],
              kind: "incident",
              toAddress: onShiftUser.email,
              subject: `[Tidewell] ${spec.name}: ${inc.message}`,
              status: "sent",
              sentAt: openedAt + 4000,
            });
            if (inc.cause === "hold-overrun") {
              await tx.insert(s.holds).values({
                tankId: tank.id,
                reason: "EC standard check",
                placedBy: userIds.grower,
                placedAt: openedAt - 75 * MIN,
                plannedEndAt: openedAt - 30 * MIN,
                releasedAt: resolvedAt,
                releasedBy: userIds.grower,
                releaseKind: "manual",
              });
            }
          }
        }
      }
    }

    // Default alert rules for the organisation (tank-specific overrides are added in settings).
    const causes = [
      "out-of-band", "rate-of-change", "stale", "flatline", "implausible", "calibration-due-soon", "calibration-lapsed",
      "calibration-rejected", "probe-replace", "buffer-like", "out-of-solution", "hold-overrun", "dosing-inhibit-overrun",
    ];
    await tx.insert(s.alertRules).values(causes.map((cause) => ({ orgId: org.id, cause, lapsedRouteRole: cause === "out-of-band" ? ("grower" as const) : null })));
  });

  await insertBulk(client, readingRows, rollupRows);

  if (credentialsFile) {
    fs.mkdirSync(path.dirname(credentialsFile), { recursive: true });
    fs.writeFileSync(credentialsFile, JSON.stringify(credentials, null, 2), { mode: 0o600 });
  }
}

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

async function audit(tx: Tx, orgId: number, userId: number, at: number, action: string, entity: string, entityId: number, detail: Record<string, unknown>) {
  await tx.insert(s.auditLog).values({ orgId, userId, at, action, entity, entityId, detail });
}

function atHour(t: number, hour: number) {
  return Math.floor(t / DAY_MS) * DAY_MS + hour * 3_600_000;
}

async function insertPhRun(
  tx: Tx,
  o: { probeId: number; tankId: number; userId: number; at: number; tempC: number; electrode: Electrode; holdId: number; asFoundPh: number | null },
) {
  const buffers = ["tech-7.00", "tech-4.01"] as const;
  const points = buffers.map((buffer, i) => ({ buffer, tempC: o.tempC + i * 0.1, mv: electrodeMv(bufferPh(buffer, o.tempC + i * 0.1), o.tempC + i * 0.1, o.electrode) }));
  const fit = fitPh(points);
  const accepted = fit.verdict === "accepted";
  const [run] = await tx
    .insert(s.calibrationRuns)
    .values({
      probeId: o.probeId,
      tankId: o.tankId,
      source: "guided",
      status: fit.verdict,
      startedBy: o.userId,
      startedAt: o.at - 12 * MIN,
      completedAt: o.at,
      effectiveAt: accepted ? o.at : null,
      slopePct: fit.slopePct,
      offsetMv: fit.offsetMv,
      reasons: fit.reasons,
      asFoundErrorPh: o.asFoundPh === null ? null : o.asFoundPh - bufferPh("tech-7.00", o.tempC),
      holdId: o.holdId,
    })
    .returning();
  await tx.insert(s.calibrationPoints).values(
    points.map((p, i) => ({
      runId: run.id,
      seq: i + 1,
      purpose: "point" as const,
      standard: p.buffer,
      lot: `B${p.buffer.slice(5, 6)}-2611-${17 + i}`,
      expiresOn: "2027-09-30",
      mv: p.mv,
      tempC: p.tempC,
      expected: bufferPh(p.buffer, p.tempC),
      capturedAt: o.at - (8 - i * 4) * MIN,
    })),
  );
  return { id: run.id, effectiveAt: o.at, slopePct: fit.slopePct, offsetMv: fit.offsetMv };
}

async function insertEcRun(tx: Tx, o: { probeId: number; tankId: number; userId: number; at: number; tempC: number; cellK: number; holdId: number }) {
  const standard = { ec25UsPerCm: 2770, alphaPerC: 0.019 };
  const conductanceUs = ecStandardAt(standard, o.tempC) / o.cellK;
  const fit = fitEc({ standard, conductanceUs, tempC: o.tempC, nominalCellConstant: 1.0 });
  const [run] = await tx
    .insert(s.calibrationRuns)
    .values({
      probeId: o.probeId,
      tankId: o.tankId,
      source: "guided",
      status: fit.verdict,
      startedBy: o.userId,
      startedAt: o.at - 6 * MIN,
      completedAt: o.at,
      effectiveAt: fit.verdict === "accepted" ? o.at : null,
      cellConstant: fit.cellConstant,
      deviationPct: fit.deviationPct,
      reasons: fit.reasons,
      holdId: o.holdId,
    })
    .returning();
  await tx.insert(s.calibrationPoints).values({
    runId: run.id,
    seq: 1,
    purpose: "point",
    standard: JSON.stringify(standard),
    lot: "EC277-2610-04",
    expiresOn: "2027-04-30",
    conductanceUs,
    tempC: o.tempC,
    expected: ecStandardAt(standard, o.tempC),
    capturedAt: o.at - MIN,
  });
  return { id: run.id, effectiveAt: o.at, cellConstant: fit.cellConstant };
}

function pushReading(rows: string[], rollups: string[], probeId: number, t: number, raw: number, value: number, quality: string, runId: number | undefined) {
  rows.push(`(${probeId},${t},${raw},${value},'${quality}',${runId ?? "NULL"})`);
  rollups.push(`(${probeId},${Math.floor(t / MIN) * MIN},${value},${value},${value},1)`);
}

async function insertBulk(client: Client, readingRows: string[], rollupRows: string[]) {
  const statements: InStatement[] = [];
  for (let i = 0; i < readingRows.length; i += 2000) {
    statements.push(`INSERT INTO readings (probe_id, ts, raw, value, quality, calibration_run_id) VALUES ${readingRows.slice(i, i + 2000).join(",")}`);
    statements.push(`INSERT INTO rollups (probe_id, minute, min, max, sum, count) VALUES ${rollupRows.slice(i, i + 2000).join(",")}`);
  }
  // The hourly rollups are the minute ones folded per hour (as the ingest keeps them).
  statements.push(`INSERT INTO rollups_hourly (probe_id, hour, min, max, sum, count)
    SELECT probe_id, (minute / 3600000) * 3600000, min(min), max(max), sum(sum), sum(count) FROM rollups GROUP BY 1, 2`);
  await client.batch(statements, "write");
}
