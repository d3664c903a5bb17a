// The alert runner against real parts: a migrated, seeded temporary database, the demo's SMTP
// sink and the embedded broker, each in its own process (tests/integration/helpers). Simulated time: readings and ticks
// are fed with explicit timestamps, so nothing here waits on the wall clock.
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import mqtt, { type MqttClient } from "mqtt";
import { and, eq, gt } from "drizzle-orm";
import type { TestDatabase } from "./helpers/database";
import { freePort } from "./helpers/ports";
import { spawnTsx } from "./helpers/processes";
import { startBroker } from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { waitFor } from "../e2e/stack";
import type { Db } from "@/db/client";
import type { AlertRunner } from "@/ingest/alerts/runner";
import { PackedReadingsBuilder, type PackedReadings } from "@/ingest/packed-readings";
import type { DeviceCredential } from "@/db/seed";

const MIN = 60_000;
// 02:00 in Dublin (UTC+0 in December): the night shift.
const T0 = Date.UTC(2026, 11, 1, 2, 0);

interface Sunk {
  id: number;
  to: string[];
  subject: string;
  text: string;
}

const used = useTestDatabase({ label: "alerts", now: T0, per: "file" });
let testDb: TestDatabase;
let sinkUrl: string;
let db: Db;
let schema: typeof import("@/db/schema");
let runnerMod: typeof import("@/ingest/alerts/runner");
let runner: AlertRunner;
let ingestClient: MqttClient;
let t = T0;
const dosing = new Map<string, { inhibit: boolean; holdId: number | null }>();
const orgEvents: { type: string; summary: string }[] = [];

type Kind = "ph" | "ec" | "temp";
const tanks = new Map<string, { id: number; orgId: number; probes: Record<Kind, number>; band: Record<Kind, [number, number]> }>();
/** Value overrides per "tank name:kind", as a function of time. */
const faults = new Map<string, (t: number) => number>();
/** Held tanks ("L1") or single held probes ("G1:ph"): their readings are flagged held. */
const held = new Set<string>();
/** Probes ("tank name:kind") that stopped reporting. */
const silent = new Set<string>();

async function mail(to: string, subjectPart: string): Promise<Sunk[]> {
  const res = await fetch(`${sinkUrl}/messages?to=${encodeURIComponent(to)}`);
  const { messages } = (await res.json()) as { messages: Sunk[] };
  return messages.filter((m) => m.subject.includes(subjectPart));
}

function batchAt(at: number): PackedReadings {
  const out = new PackedReadingsBuilder();
  for (const [name, tank] of tanks) {
    for (const kind of ["ph", "ec", "temp"] as const) {
      if (silent.has(`${name}:${kind}`)) continue;
      const [lo, hi] = tank.band[kind];
      const wobble = Math.sin(at / (5 * MIN) + tank.id);
      const normal = (lo + hi) / 2 + wobble * (hi - lo) * 0.05;
      const value = faults.get(`${name}:${kind}`)?.(at) ?? normal;
      const raw = kind === "ph" ? (7 - value) * 59 + wobble : kind === "ec" ? value + wobble * 3 : value;
      const quality = held.has(name) || held.has(`${name}:${kind}`) ? "held" : "ok";
      out.push(tank.orgId, tank.id, tank.probes[kind], kind, at, raw, value, quality, null);
    }
  }
  return out.take();
}

/** Advances simulated time to `end`: a batch of readings from every tank and a tick every 30 s. */
async function runUntil(end: number) {
  while (t < end) {
    t += 30_000;
    await runner.onReadings(batchAt(t));
    await runner.tick(t);
  }
}

async function incidentsOf(tankName: string, cause: string) {
  const tank = tanks.get(tankName)!;
  return db.select().from(schema.incidents).where(and(eq(schema.incidents.tankId, tank.id), eq(schema.incidents.cause, cause))).orderBy(schema.incidents.id);
}

async function eventsOf(incidentId: number) {
  return db.select().from(schema.incidentEvents).where(eq(schema.incidentEvents.incidentId, incidentId)).orderBy(schema.incidentEvents.id);
}

/** A pH ramp of 0.2 per minute (slower than the rate-of-change limit) from `from` towards `to`. */
function ramp(start: number, from: number, to: number) {
  return (at: number) => {
    const moved = (0.2 * Math.max(0, at - start)) / MIN;
    return from < to ? Math.min(to, from + moved) : Math.max(to, from - moved);
  };
}

function newRunner() {
  return runnerMod.createAlertRunner({
    db,
    publish: (topic, payload, opts) => ingestClient.publishAsync(topic, payload, opts),
    clock: () => t,
    log: () => undefined,
  });
}

beforeAll(async () => {
  testDb = used.db;
  process.env.DATABASE_URL = testDb.url;
  const [smtpPort, httpPort] = [await freePort(), await freePort()];
  process.env.SMTP_URL = `smtp://127.0.0.1:${smtpPort}`;
  process.env.APP_URL = "http://tidewell.test";
  sinkUrl = `http://127.0.0.1:${httpPort}`;
  const { getDb } = await import("@/db/client");
  schema = await import("@/db/schema");
  runnerMod = await import("@/ingest/alerts/runner");
  db = getDb();

  const sink = spawnTsx("mail-sink", "scripts/mail-sink.ts", [], { env: { MAIL_SINK_SMTP_PORT: String(smtpPort), MAIL_SINK_HTTP_PORT: String(httpPort) } });
  await sink.waitForLine(/HTTP on/);
  const broker = await startBroker(testDb);
  const url = broker.url;
  const { SERVICE_ACCOUNTS } = await import("@/ingest/topics");
  ingestClient = await mqtt.connectAsync(url, { clientId: "tidewell-ingest-test", username: SERVICE_ACCOUNTS.ingest.username, password: SERVICE_ACCOUNTS.ingest.password(), reconnectPeriod: 0 });

  // Two controllers listen for their dosing commands with their own issued credentials.
  const creds = JSON.parse(fs.readFileSync(testDb.credentialsFile, "utf8")) as DeviceCredential[];
  for (const c of creds.filter((c) => c.controllerId === "ctl-north-l1" || c.controllerId === "ctl-north-l2")) {
    const device = await mqtt.connectAsync(url, { clientId: c.controllerId, username: c.username, password: c.password });
    device.on("message", (_topic, payload) => {
      const cmd = JSON.parse(payload.toString()) as { inhibit: boolean; holdId: number | null };
      dosing.set(c.controllerId, cmd);
    });
    await device.subscribeAsync(`tw/v1/dev/${c.controllerId}/cmd/#`, { qos: 1 });
  }
  const web = await mqtt.connectAsync(url, { clientId: "tidewell-web-test", username: SERVICE_ACCOUNTS.web.username, password: SERVICE_ACCOUNTS.web.password() });
  web.on("message", (_topic, payload) => orgEvents.push(JSON.parse(payload.toString()) as { type: string; summary: string }));
  await web.subscribeAsync("tw/v1/org/+/event", { qos: 1 });

  const tankRows = await db.select().from(schema.tanks);
  const probeRows = await db.select().from(schema.probes);
  const siteRows = await db.select().from(schema.sites);
  for (const tank of tankRows) {
    const p = (k: Kind) => probeRows.find((x) => x.tankId === tank.id && x.kind === k)!.id;
    tanks.set(tank.name.split(" ")[0], {
      id: tank.id,
      orgId: siteRows.find((s) => s.id === tank.siteId)!.orgId,
      probes: { ph: p("ph"), ec: p("ec"), temp: p("temp") },
      band: { ph: [tank.phMin, tank.phMax], ec: [tank.ecMinUs, tank.ecMaxUs], temp: [tank.tempMin, tank.tempMax] },
    });
  }
  runner = newRunner();
}, 120_000);

afterAll(async () => {
  await ingestClient?.endAsync();
});

describe("alert runner", () => {
  it("opens one incident for a fault and mails the night manager on shift a signed acknowledge link", async () => {
    faults.set("L1:ph", ramp(T0 + MIN, 6.0, 6.9));
    await runUntil(T0 + 12 * MIN);
    const open = await incidentsOf("L1", "out-of-band");
    expect(open).toHaveLength(1);
    expect(open[0]).toMatchObject({ state: "open", measure: "ph", calibrationLapsed: false });
    expect(open[0].message).toMatch(/^pH 6\.\d\d above 6\.5$/);
    // Nothing else of L1 fired: the ramp stays under the rate-of-change limit.
    const l1 = await db.select().from(schema.incidents).where(and(eq(schema.incidents.tankId, tanks.get("L1")!.id), gt(schema.incidents.openedAt, T0)));
    expect(l1.map((i) => `${i.cause} ${i.message}`)).toEqual([`out-of-band ${open[0].message}`]);

    await waitFor("the mail", async () => (await mail("night@larkspur.example", "L1 Butterhead: Out of band")).length === 1, 10_000);
    const [m] = await mail("night@larkspur.example", "L1 Butterhead: Out of band");
    expect(m.text).toContain(`http://tidewell.test/incidents/${open[0].id}`);
    expect(m.text).toContain("on the night shift");
    expect(await mail("grower@larkspur.example", "L1 Butterhead")).toHaveLength(0);
    const events = await eventsOf(open[0].id);
    expect(events.map((e) => e.kind)).toEqual(["opened", "notified"]);
    expect(events[1].detail).toBe("E-mail to Priya Lindqvist (night manager, on the night shift)");
    const sent = await db.select().from(schema.notifications).where(eq(schema.notifications.incidentId, open[0].id));
    expect(sent).toMatchObject([{ kind: "incident", toAddress: "night@larkspur.example", status: "sent" }]);
    expect(orgEvents.some((e) => e.type === "incident.opened" && e.summary.startsWith("L1 Butterhead"))).toBe(true);

    const token = /\/ack\/([\w.-]+)/.exec(m.text)![1];
    const { verifyAckToken } = await import("@/ingest/alerts/ack-link");
    const { acknowledgeFromLink } = await import("@/db/queries/incident-actions");
    const checked = await verifyAckToken(token, t);
    expect(checked.ok).toBe(true);
    if (!checked.ok) return;
    await acknowledgeFromLink(db, checked.claims, t);
    await expect(acknowledgeFromLink(db, checked.claims, t)).rejects.toThrow(/already been used/);
    expect(await verifyAckToken(token, t + 25 * 60 * MIN)).toEqual({ ok: false, reason: "expired" });
    const [acked] = await incidentsOf("L1", "out-of-band");
    expect(acked).toMatchObject({ state: "acknowledged", acknowledgedAt: t });
  });

  it("routes an alert on a lapsed-calibration probe to the role the rule names", async () => {
    // L3's pH calibration lapsed (41 days); the seeded out-of-band rule routes such alerts to the grower.
    faults.set("L3:ph", ramp(t, 6.0, 6.9));
    await runUntil(t + 10 * MIN);
    const [incident] = await incidentsOf("L3", "out-of-band");
    expect(incident).toMatchObject({ state: "open", calibrationLapsed: true });
    expect(incident.message).toContain("calibration lapsed, reading may be off");
    await waitFor("the mail", async () => (await mail("grower@larkspur.example", "L3 Romaine: Out of band")).length === 1, 10_000);
    expect(await mail("night@larkspur.example", "L3 Romaine: Out of band")).toHaveLength(0);
    faults.set("L3:ph", ramp(t, 6.9, 6.0));
  });

  it("clears when the fault ends and resolves after staying clear", async () => {
    faults.set("L1:ph", ramp(t, 6.9, 6.0));
    await runUntil(t + 6 * MIN);
    const [cleared] = await incidentsOf("L1", "out-of-band");
    expect(cleared.clearedAt).not.toBeNull();
    expect(cleared.state).toBe("acknowledged");
    await runUntil(cleared.clearedAt! + runnerMod.AUTO_RESOLVE_AFTER_MS + MIN);
    const [resolved] = await incidentsOf("L1", "out-of-band");
    expect(resolved.state).toBe("resolved");
    expect((await eventsOf(resolved.id)).map((e) => e.kind)).toEqual(["opened", "notified", "acknowledged", "cleared", "resolved"]);
    faults.delete("L1:ph");
  });

  it("a hold silences the tank, inhibits dosing, and alerts return after settling once released", async () => {
    const { placeHold, releaseHold } = await import("@/db/queries/holds");
    const grower = (await db.select().from(schema.users).where(eq(schema.users.role, "grower")))[0];
    const { hold } = await placeHold(db, grower, { tankId: tanks.get("L1")!.id, reason: "Probe cleaning and calibration", minutes: 30 }, t);
    held.add("L1");
    faults.set("L1:ph", () => 4.0); // the probe sits in pH 4 buffer
    const heldFrom = t;
    await runUntil(t + 15 * MIN);
    expect(await db.select().from(schema.incidents).where(and(eq(schema.incidents.tankId, tanks.get("L1")!.id), gt(schema.incidents.openedAt, heldFrom)))).toEqual([]);
    // The web could not be asked here, so the runner sent the retained inhibit itself.
    await waitFor("the inhibit", async () => dosing.get("ctl-north-l1")?.inhibit === true, 10_000);
    expect(dosing.get("ctl-north-l1")?.holdId).toBe(hold.id);

    await releaseHold(db, { orgId: grower.orgId, user: grower }, hold.id, t);
    const releasedAt = t;
    held.delete("L1");
    faults.set("L1:ph", () => 6.9); // back in the tank, but the tank really is out of band
    await runUntil(releasedAt + 9 * MIN);
    await waitFor("the resume", async () => dosing.get("ctl-north-l1")?.inhibit === false, 10_000);
    expect(await db.select().from(schema.incidents).where(and(eq(schema.incidents.tankId, tanks.get("L1")!.id), gt(schema.incidents.openedAt, heldFrom)))).toEqual([]);
    await runUntil(releasedAt + 14 * MIN);
    const after = await db.select().from(schema.incidents).where(and(eq(schema.incidents.tankId, tanks.get("L1")!.id), gt(schema.incidents.openedAt, heldFrom)));
    expect(after.map((i) => i.cause)).toEqual(["out-of-band"]);
    // Settling (10 min) then the out-of-band delay (2 min): never earlier.
    expect(after[0].openedAt).toBeGreaterThanOrEqual(releasedAt + 12 * MIN);
    const audit = await db.select().from(schema.auditLog).where(and(eq(schema.auditLog.entity, "hold"), eq(schema.auditLog.entityId, hold.id)));
    expect(audit.map((a) => a.action)).toEqual(["hold.place", "hold.release"]);
  });

  it("escalates to the owner when nobody acknowledges", async () => {
    const [incident] = (await incidentsOf("L1", "out-of-band")).filter((i) => i.state === "open");
    await runUntil(incident.openedAt + 16 * MIN);
    const [escalated] = (await incidentsOf("L1", "out-of-band")).filter((i) => i.id === incident.id);
    expect(escalated.escalatedAt).not.toBeNull();
    await waitFor("the owner's mail", async () => (await mail("owner@larkspur.example", "Unacknowledged: L1 Butterhead: Out of band")).length === 1, 10_000);
    const kinds = (await eventsOf(incident.id)).map((e) => e.kind);
    expect(kinds).toEqual(["opened", "notified", "escalated", "notified"]);
    const owners = await db.select().from(schema.notifications).where(and(eq(schema.notifications.incidentId, incident.id), eq(schema.notifications.kind, "escalation")));
    expect(owners.map((n) => n.toAddress)).toEqual(["owner@larkspur.example"]);
    faults.delete("L1:ph");
  });

  it("a forgotten hold alerts, then expires at the site's maximum and dosing resumes", async () => {
    const { placeHold } = await import("@/db/queries/holds");
    const grower = (await db.select().from(schema.users).where(eq(schema.users.role, "grower")))[0];
    await db.update(schema.sites).set({ maxHoldMinutes: 60 });
    const placedAt = t;
    const { hold } = await placeHold(db, grower, { tankId: tanks.get("L2")!.id, reason: "EC standard check", minutes: 30 }, t);
    held.add("L2");
    await runUntil(placedAt + 32 * MIN);
    const [overrun] = await incidentsOf("L2", "hold-overrun");
    expect(overrun).toMatchObject({ state: "open" });
    expect(overrun.message).toMatch(/^Hold has run .+ past its planned end/);
    await waitFor("the mail", async () => (await mail("night@larkspur.example", "L2 Oakleaf: Hold overrunning")).length === 1, 10_000);

    await runUntil(placedAt + 61 * MIN);
    held.delete("L2");
    const [expired] = await db.select().from(schema.holds).where(eq(schema.holds.id, hold.id));
    expect(expired).toMatchObject({ releaseKind: "expired", releasedBy: null });
    expect(expired.dosingResumeSentAt).not.toBeNull();
    await waitFor("the resume", async () => dosing.get("ctl-north-l2")?.inhibit === false, 10_000);
    const [cleared] = await incidentsOf("L2", "hold-overrun");
    expect(cleared.clearedAt).not.toBeNull();
    const audit = await db.select().from(schema.auditLog).where(and(eq(schema.auditLog.entity, "hold"), eq(schema.auditLog.entityId, hold.id)));
    expect(audit.map((a) => [a.action, a.userId])).toEqual([["hold.place", grower.id], ["hold.expire", null]]);
  });

  it("a restarted runner picks up the persisted state and fires nothing twice", async () => {
    const before = { incidents: (await db.select().from(schema.incidents)).length, mails: (await db.select().from(schema.notifications)).length };
    faults.set("G2:ph", ramp(t, 6.0, 6.9)); // a fault already firing before the restart
    await runUntil(t + 8 * MIN);
    const firing = await incidentsOf("G2", "out-of-band");
    expect(firing).toHaveLength(1);
    runner = newRunner();
    await runner.onReadings(batchAt(t)); // the last batch again, as a redelivery after restart
    await runner.tick(t);
    await runUntil(t + 3 * MIN);
    expect(await incidentsOf("G2", "out-of-band")).toHaveLength(1);
    const all = await db.select().from(schema.incidents);
    expect(all.slice(before.incidents).map((i) => `${i.tankId}:${i.cause}`)).toEqual([`${tanks.get("G2")!.id}:out-of-band`]);
    expect((await db.select().from(schema.notifications)).length).toBe(before.mails + 1);
    faults.delete("G2:ph");
  });

  it("saves running state that raised no event at most once a second, and all of it on a tick", async () => {
    const probe = `probe:${tanks.get("G1")!.probes.ph}`;
    const savedAt = async () => (await db.select().from(schema.alertState).where(eq(schema.alertState.key, probe)))[0]?.updatedAt;
    runner = newRunner();
    await runner.onReadings(batchAt(t)); // a new runner saves its first batch
    const first = t;
    expect(await savedAt()).toBe(first);
    t += 400;
    await runner.onReadings(batchAt(t)); // quiet, and within the second: waits
    expect(await savedAt()).toBe(first);
    t += 700;
    await runner.onReadings(batchAt(t)); // a second and more since the save
    expect(await savedAt()).toBe(t);
    t += 100;
    await runner.onReadings(batchAt(t));
    await runner.tick(t); // a tick saves what waited
    expect(await savedAt()).toBe(t);
  });

  it("skips users who turned e-mail notifications off, and says so in the timeline", async () => {
    await db.update(schema.users).set({ notifyEmail: false }).where(eq(schema.users.role, "night_manager"));
    faults.set("G3:ph", ramp(t, 6.0, 6.9));
    await runUntil(t + 8 * MIN);
    const [incident] = await incidentsOf("G3", "out-of-band");
    const notified = (await eventsOf(incident.id)).filter((e) => e.kind === "notified");
    expect(notified.map((e) => e.detail)).toEqual(["Nobody to e-mail: no active night manager on the night shift at North Greenhouse has e-mail notifications on"]);
    expect(await mail("night@larkspur.example", "G3 Pak choi")).toHaveLength(0);
    await db.update(schema.users).set({ notifyEmail: true }).where(eq(schema.users.role, "night_manager"));
    faults.delete("G3:ph");
  });

  it("a hold on one probe silences only that probe; the tank's other probes still alert", async () => {
    const { placeHold, releaseHold } = await import("@/db/queries/holds");
    const grower = (await db.select().from(schema.users).where(eq(schema.users.role, "grower")))[0];
    const g1 = tanks.get("G1")!;
    const from = t;
    const { hold } = await placeHold(db, grower, { tankId: g1.id, probeId: g1.probes.ph, reason: "pH probe cleaning", minutes: 30 }, t);
    held.add("G1:ph");
    faults.set("G1:ph", () => 4.0); // the held pH probe sits in pH 4 buffer: silent
    const [lo, hi] = g1.band.ec;
    faults.set("G1:ec", (at) => Math.min(hi + 300, (lo + hi) / 2 + (200 * (at - from)) / MIN)); // EC drifts out of band (under the rate limit)
    silent.add("G1:temp"); // and the temperature probe stops reporting
    await runUntil(from + 8 * MIN);
    const opened = await db.select().from(schema.incidents).where(and(eq(schema.incidents.tankId, g1.id), gt(schema.incidents.openedAt, from)));
    expect(opened.map((i) => `${i.cause} ${i.measure}`).sort()).toEqual(["out-of-band ec", "stale temp"]);

    await releaseHold(db, { orgId: grower.orgId, user: grower }, hold.id, t);
    held.delete("G1:ph");
    silent.delete("G1:temp");
    for (const k of ["G1:ph", "G1:ec"]) faults.delete(k);
    await runUntil(t + 2 * MIN);
  });

  it("sends the morning digest of calibrations due once, at the start of the day shift", async () => {
    const morning = Date.UTC(2026, 11, 1, 7, 0); // 07:00 in Dublin
    t = morning - MIN;
    await runUntil(morning + MIN);
    await waitFor("the digest", async () => (await mail("grower@larkspur.example", "North Greenhouse: ")).length === 1, 10_000);
    const [digest] = await mail("grower@larkspur.example", "North Greenhouse: ");
    expect(digest.subject).toMatch(/calibrations? due/);
    expect(digest.text).toMatch(/L3 Romaine: pH probe PH-24-0103, lapsed/);
    expect(digest.text).toMatch(/L2 Oakleaf: pH probe PH-24-0102, due soon/);
    expect(digest.text).toContain("gloves and eye protection");
    await runUntil(morning + 3 * MIN);
    expect(await mail("grower@larkspur.example", "North Greenhouse: ")).toHaveLength(1);
    expect(await mail("grower@larkspur.example", "Propagation House: ")).toHaveLength(1);
  });

  it("gives probes one stale period to report after a gap nobody watched, then pages", async () => {
    const staleBefore = (await db.select().from(schema.incidents).where(eq(schema.incidents.cause, "stale"))).length;
    t += 10 * MIN; // the worker was down: no readings and no ticks for ten minutes
    runner = newRunner();
    await runner.tick(t);
    expect((await db.select().from(schema.incidents).where(eq(schema.incidents.cause, "stale"))).length, "no page at once for a gap nobody watched").toBe(staleBefore);
    t += 3 * MIN; // still nothing from any device: now it is stale (default 120 s, common practice)
    await runner.tick(t);
    await runner.tick(t + 30_000);
    expect((await db.select().from(schema.incidents).where(eq(schema.incidents.cause, "stale"))).length).toBeGreaterThan(staleBefore);
  });
});
