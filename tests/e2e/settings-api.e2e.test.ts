// Settings over the HTTP API of the running app: every form's route refuses bad input with field
// messages, an owner and a grower set up a new site with a tank, probes and a controller, the
// controller streams into the new tank, and revoking its credentials cuts it off the broker.
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Client } from "@libsql/client";
import { connectAsync, type MqttClient } from "mqtt";
import { topics } from "@/ingest/topics";
import { HttpSession, sessionFor } from "./session";
import { OTHER_ORG_USER } from "./fixtures";
import { waitFor } from "./stack";
import { removeSite } from "./settings-teardown";
import { openStackDb } from "./database";

type Body = Record<string, unknown>;
interface ApiError {
  error: { code: string; message: string; fields?: Record<string, string> };
}

async function call(s: HttpSession, method: string, path: string, body?: unknown) {
  const res = await s.fetch(path, body === undefined ? { method } : { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  const text = await res.text();
  let json: unknown = null;
  try {
    json = JSON.parse(text);
  } catch {
    /* CSV */
  }
  return { status: res.status, json: json as Body & ApiError, text, headers: res.headers };
}

const RUN = Date.now().toString(36);
const site = {
  name: `Test site ${RUN}`,
  timeZone: "America/Chicago",
  dayStartHour: 6,
  nightStartHour: 18,
  dayRole: "grower",
  nightRole: "night_manager",
  escalateAfterMinutes: 10,
  maxCalibrationIntervalDays: 21,
  maxHoldMinutes: 120,
};
// DOMAIN.md section 4: cucumber pH 5.5–6.0, EC 1.7–2.5 mS/cm; solution 18–22 °C (common practice)
const tankBody = (siteId: number, zoneId: number | null) => ({
  siteId,
  zoneId,
  name: `C1 Cucumber ${RUN}`,
  crop: "cucumber",
  phMin: 5.5,
  phMax: 6.0,
  ecMinUs: 1700,
  ecMaxUs: 2500,
  tempMin: 18,
  tempMax: 22,
  ecAlphaPerC: 0.019,
  spotCheckTolerancePh: 0.1,
  spotCheckToleranceEcUs: 100,
  calibrationIntervalDays: 14,
});

describe("settings API", () => {
  const baseURL = inject("baseURL");
  let owner: HttpSession;
  let grower: HttpSession;
  let night: HttpSession;
  let db: Client;
  const made: { siteId?: number; zoneId?: number; tankId?: number; probes: Record<string, number>; deviceId?: number; secret?: string; username?: string; controllerId: string } = {
    probes: {},
    controllerId: `ctl-test-${RUN}`,
  };

  beforeAll(async () => {
    [owner, grower, night] = await Promise.all([sessionFor(baseURL, "owner"), sessionFor(baseURL, "grower"), sessionFor(baseURL, "night_manager")]);
    db = openStackDb();
  });
  afterAll(async () => {
    if (made.siteId) await removeSite(db, made.siteId);
    db?.close();
  });

  describe("refuses bad input with a message under each field", () => {
    const cases: [string, string, Body, string[]][] = [
      ["POST", "/api/settings/users", { email: "nope", name: "", role: "boss" }, ["email", "name", "role"]],
      ["PATCH", "/api/settings/users/1", {}, ["_"]],
      ["PATCH", "/api/settings/organisation", { name: "" }, ["name"]],
      ["POST", "/api/settings/sites", { ...site, timeZone: "Nowhere/Land", nightStartHour: 6 }, ["timeZone", "nightStartHour"]],
      ["POST", "/api/settings/sites", { ...site, escalateAfterMinutes: 0, maxHoldMinutes: "long" }, ["escalateAfterMinutes", "maxHoldMinutes"]],
      ["POST", "/api/settings/sites/1/zones", { name: " " }, ["name"]],
      ["POST", "/api/settings/tanks", { ...tankBody(1, null), phMin: 6.5, phMax: 5.5, ecMaxUs: 30_000 }, ["phMax", "ecMaxUs"]],
      ["POST", "/api/settings/tanks", { ...tankBody(1, null), ecAlphaPerC: -1, calibrationIntervalDays: 0 }, ["ecAlphaPerC", "calibrationIntervalDays"]],
      ["POST", "/api/settings/probes", { tankId: 1, kind: "ec", serial: "", nominalCellConstant: null }, ["serial", "nominalCellConstant"]],
      ["POST", "/api/settings/probes/1/move", {}, ["tankId"]],
      ["POST", "/api/settings/probes/1/retire", {}, ["confirm"]],
      ["POST", "/api/settings/probes/1/replace", { serial: "x y", nominalCellConstant: null }, ["serial", "confirm"]],
      ["POST", "/api/settings/devices", { tankId: 0, controllerId: "tidewell-web" }, ["tankId", "controllerId"]],
      ["POST", "/api/settings/devices/1/rotate", {}, ["confirm"]],
      ["POST", "/api/settings/devices/1/revoke", {}, ["confirm"]],
      ["PATCH", "/api/settings/preferences", { ecUnit: "mho" }, ["ecUnit"]],
      ["PATCH", "/api/settings/preferences", {}, ["_"]],
      ["GET", "/api/settings/audit?limit=0", {}, ["limit"]],
      ["GET", "/api/exports/readings?tank=1&from=2000&to=1000", {}, ["to"]],
      ["GET", "/api/exports/calibrations?from=x&to=1", {}, ["from"]],
    ];
    for (const [method, path, body, expected] of cases) {
      it(`${method} ${path} → ${expected.join(", ")}`, async () => {
        const r = await call(owner, method, path, method === "GET" ? undefined : body);
        expect(r.status, r.text).toBe(400);
        expect(r.json.error.code).toBe("invalid_input");
        expect(Object.keys(r.json.error.fields ?? {}).sort()).toEqual([...expected].sort());
      });
    }

    it("refuses a body that is not JSON", async () => {
      const res = await owner.fetch("/api/settings/sites", { method: "POST", headers: { "content-type": "application/json" }, body: "{name:" });
      expect(res.status).toBe(400);
      expect(((await res.json()) as ApiError).error.code).toBe("invalid_json");
    });
  });

  it("lets the owner add a site and a zone, but not the grower", async () => {
    expect((await call(grower, "POST", "/api/settings/sites", site)).status).toBe(403);
    const created = await call(owner, "POST", "/api/settings/sites", site);
    expect(created.status, created.text).toBe(201);
    made.siteId = (created.json.site as { id: number }).id;
    const zone = await call(owner, "POST", `/api/settings/sites/${made.siteId}/zones`, { name: "Bay A" });
    expect(zone.status).toBe(201);
    made.zoneId = (zone.json.zone as { id: number }).id;
    const list = await call(grower, "GET", "/api/settings/sites");
    const mine = (list.json.sites as { id: number; timeZone: string; zones: { name: string }[] }[]).find((s) => s.id === made.siteId)!;
    expect(mine.timeZone).toBe("America/Chicago");
    expect(mine.zones.map((z) => z.name)).toEqual(["Bay A"]);
  });

  it("keeps a tank's calibration interval within its site's maximum", async () => {
    const tooLong = await call(grower, "POST", "/api/settings/tanks", { ...tankBody(made.siteId!, made.zoneId!), calibrationIntervalDays: 30 });
    expect(tooLong.status).toBe(422);
    expect(tooLong.json.error.fields?.calibrationIntervalDays).toMatch(/at most 21 days/);
    const created = await call(grower, "POST", "/api/settings/tanks", tankBody(made.siteId!, made.zoneId!));
    expect(created.status, created.text).toBe(201);
    made.tankId = (created.json.tank as { id: number }).id;
    // Lowering the site's maximum brings the tank down with it.
    expect((await call(owner, "PUT", `/api/settings/sites/${made.siteId}`, { ...site, maxCalibrationIntervalDays: 10 })).status).toBe(200);
    const tanks = (await call(grower, "GET", "/api/settings/tanks")).json.tanks as { id: number; calibrationIntervalDays: number }[];
    expect(tanks.find((t) => t.id === made.tankId)!.calibrationIntervalDays).toBe(10);
  });

  it("refuses a zone of another site and edits the target band", async () => {
    const other = (await call(grower, "GET", "/api/settings/sites")).json.sites as { id: number; zones: { id: number }[] }[];
    const foreignZone = other.find((s) => s.id !== made.siteId && s.zones.length)!.zones[0].id;
    const bad = await call(grower, "PUT", `/api/settings/tanks/${made.tankId}`, { ...tankBody(made.siteId!, foreignZone), calibrationIntervalDays: 10 });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields?.zoneId).toBeDefined();
    const ok = await call(grower, "PUT", `/api/settings/tanks/${made.tankId}`, { ...tankBody(made.siteId!, made.zoneId!), phMax: 6.1, calibrationIntervalDays: 10 });
    expect(ok.status, ok.text).toBe(200);
    expect((ok.json.tank as { phMax: number }).phMax).toBe(6.1);
    expect((await call(night, "PUT", `/api/settings/tanks/${made.tankId}`, tankBody(made.siteId!, made.zoneId!))).status).toBe(403);
  });

  it("adds, moves, replaces and retires probes, keeping the history", async () => {
    for (const [kind, cell] of [["ph", null], ["ec", 1.0], ["temp", null]] as const) {
      const r = await call(grower, "POST", "/api/settings/probes", { tankId: made.tankId, kind, serial: `${kind.toUpperCase()}-${RUN}`, nominalCellConstant: cell });
      expect(r.status, r.text).toBe(201);
      made.probes[kind] = (r.json.probe as { id: number }).id;
    }
    const dupSerial = await call(grower, "POST", "/api/settings/probes", { tankId: made.tankId, kind: "ph", serial: `PH-${RUN}`, nominalCellConstant: null });
    expect(dupSerial.status).toBe(409);
    expect(dupSerial.json.error.fields?.serial).toMatch(/already recorded/);
    const second = await call(grower, "POST", "/api/settings/probes", { tankId: made.tankId, kind: "ph", serial: `PH2-${RUN}`, nominalCellConstant: null });
    expect(second.status).toBe(409);
    expect(second.json.error.fields?.kind).toMatch(/already has a pH probe/);

    // A spare temperature probe, moved in after the first is retired.
    const spareTank = await call(grower, "POST", "/api/settings/tanks", { ...tankBody(made.siteId!, made.zoneId!), name: `Spare ${RUN}`, calibrationIntervalDays: 10 });
    const spareTankId = (spareTank.json.tank as { id: number }).id;
    const spare = await call(grower, "POST", "/api/settings/probes", { tankId: spareTankId, kind: "temp", serial: `TS2-${RUN}`, nominalCellConstant: null });
    const spareId = (spare.json.probe as { id: number }).id;
    expect((await call(grower, "POST", `/api/settings/probes/${spareId}/move`, { tankId: made.tankId })).json.error.fields?.tankId).toMatch(/already has a Temperature probe/);
    expect((await call(grower, "POST", `/api/settings/probes/${made.probes.temp}/retire`, { confirm: true })).status).toBe(200);
    expect((await call(grower, "POST", `/api/settings/probes/${made.probes.temp}/retire`, { confirm: true })).status).toBe(409);
    const moved = await call(grower, "POST", `/api/settings/probes/${spareId}/move`, { tankId: made.tankId });
    expect(moved.status, moved.text).toBe(200);
    made.probes.temp = spareId;

    const noCell = await call(grower, "POST", `/api/settings/probes/${made.probes.ec}/replace`, { serial: `EC2-${RUN}`, nominalCellConstant: null, confirm: true });
    expect(noCell.status).toBe(422);
    expect(noCell.json.error.fields?.nominalCellConstant).toBeDefined();
    const replaced = await call(grower, "POST", `/api/settings/probes/${made.probes.ec}/replace`, { serial: `EC2-${RUN}`, nominalCellConstant: 1.02, confirm: true });
    expect(replaced.status, replaced.text).toBe(201);
    const successor = replaced.json.probe as { id: number; nominalCellConstant: number };
    const all = (await call(grower, "GET", "/api/settings/probes")).json.probes as { id: number; status: string; replacedById: number | null; retiredAt: number | null }[];
    const old = all.find((p) => p.id === made.probes.ec)!;
    expect(old).toMatchObject({ status: "retired", replacedById: successor.id });
    expect(old.retiredAt).not.toBeNull();
    made.probes.ec = successor.id;
  });

  it("registers a controller whose device streams into the new tank, then revocation cuts it off", async () => {
    const mqttUrl = inject("mqttUrl");
    expect((await call(grower, "POST", "/api/settings/devices", { tankId: made.tankId, controllerId: made.controllerId })).status).toBe(403);
    const reg = await call(owner, "POST", "/api/settings/devices", { tankId: made.tankId, controllerId: made.controllerId });
    expect(reg.status, reg.text).toBe(201);
    const cred = reg.json.credentials as { deviceId: number; username: string; secret: string; controllerId: string };
    expect(cred.secret.length).toBeGreaterThanOrEqual(32);
    const again = await call(owner, "POST", "/api/settings/devices", { tankId: made.tankId, controllerId: `${made.controllerId}-b` });
    expect(again.status).toBe(409);
    expect(again.json.error.fields?.tankId).toMatch(/already has controller/);

    // The secret is stored only as a bcrypt hash and never listed.
    const listed = await call(owner, "GET", "/api/settings/devices");
    expect(listed.text).not.toContain(cred.secret);
    const stored = await db.execute({ sql: "SELECT secret_hash FROM devices WHERE id = ?", args: [cred.deviceId] });
    expect(String(stored.rows[0].secret_hash)).toMatch(/^\$2[aby]\$10\$/);

    // Rotation: the old secret stops working, the new one is the one to use.
    const rotated = await call(owner, "POST", `/api/settings/devices/${cred.deviceId}/rotate`, { confirm: true });
    expect(rotated.status).toBe(200);
    const secret = (rotated.json.credentials as { secret: string }).secret;
    expect(secret).not.toBe(cred.secret);
    await expect(connectAsync(mqttUrl, { clientId: cred.controllerId, username: cred.username, password: cred.secret, reconnectPeriod: 0, connectTimeout: 5000 })).rejects.toThrow();

    const device: MqttClient = await connectAsync(mqttUrl, { clientId: `${cred.controllerId}:test`, username: cred.username, password: secret, reconnectPeriod: 0, connectTimeout: 5000 });
    let closed = false;
    device.on("close", () => (closed = true));
    try {
      // A simulated controller's raw signals: pH electrode mV, EC conductance µS, temperature °C.
      const serials = { ph: `PH-${RUN}`, ec: `EC2-${RUN}`, temp: `TS2-${RUN}` };
      let seq = 0;
      await waitFor(
        "readings of the new tank in the database",
        async () => {
          const ts = Date.now();
          const message = { v: 1, seq: seq++, samples: [{ serial: serials.ph, ts, signal: 35 }, { serial: serials.ec, ts, signal: 2000 }, { serial: serials.temp, ts, signal: 20.5 }] };
          await device.publishAsync(topics.raw(cred.controllerId), JSON.stringify(message), { qos: 1 });
          const r = await db.execute({ sql: "SELECT count(DISTINCT probe_id) AS n FROM readings WHERE probe_id IN (?, ?, ?)", args: [made.probes.ph, made.probes.ec, made.probes.temp] });
          return Number(r.rows[0].n) === 3;
        },
        30_000,
        1000,
      );

      const revoked = await call(owner, "POST", `/api/settings/devices/${cred.deviceId}/revoke`, { confirm: true });
      expect(revoked.status, revoked.text).toBe(200);
      expect((await call(owner, "POST", `/api/settings/devices/${cred.deviceId}/revoke`, { confirm: true })).status).toBe(409);
      // The broker re-checks connected devices against the database every few seconds.
      await waitFor("the broker to disconnect the revoked device", async () => closed, 30_000);
      await expect(connectAsync(mqttUrl, { clientId: cred.controllerId, username: cred.username, password: secret, reconnectPeriod: 0, connectTimeout: 5000 })).rejects.toThrow();
      const tank = (await call(owner, "GET", "/api/settings/tanks")).json.tanks as { id: number; controllerId: string | null }[];
      expect(tank.find((t) => t.id === made.tankId)!.controllerId).toBeNull();
    } finally {
      device.end(true);
    }
  });

  it("invites by e-mail, refuses a second account for the address and keeps one active owner", async () => {
    const email = `new.grower.${RUN}@farm.example`;
    const invited = await call(owner, "POST", "/api/settings/users", { email: email.toUpperCase(), name: "New Grower", role: "grower" });
    expect(invited.status, invited.text).toBe(201);
    expect(invited.json).toMatchObject({ invitation: { email, status: "invited" }, mailed: true });
    const mails = (await (await fetch(`${inject("mailSinkURL")}/messages?to=${encodeURIComponent(email)}`)).json()) as { messages: { subject: string; text: string }[] };
    expect(mails.messages[0].text).toContain(`${baseURL}/invite/`);

    const taken = await call(owner, "POST", "/api/settings/users", { email: "grower@larkspur.example", name: "X", role: "grower" });
    expect(taken.status).toBe(409);
    expect(taken.json.error.fields?.email).toMatch(/already has an account/);

    const id = ((await call(owner, "GET", "/api/settings/users")).json.users as { id: number; email: string }[]).find((u) => u.email === email)!.id;
    const promoted = await call(owner, "PATCH", `/api/settings/users/${id}`, { role: "night_manager" });
    expect(promoted.json.user).toMatchObject({ role: "night_manager" });

    const users = (await call(owner, "GET", "/api/settings/users")).json.users as { id: number; email: string }[];
    const me = users.find((u) => u.email === "owner@larkspur.example")!;
    for (const change of [{ role: "grower" }, { active: false }]) {
      const r = await call(owner, "PATCH", `/api/settings/users/${me.id}`, change);
      expect(r.status).toBe(409);
      expect(r.json.error.message).toBe("At least one active owner must remain. Make someone else an owner first.");
    }
    expect((await call(owner, "PATCH", `/api/settings/users/${id}`, { active: false })).json.user).toMatchObject({ active: false });
    expect((await call(owner, "POST", `/api/settings/users/${id}/invitation`)).status).toBe(409);
  });

  it("keeps each user's preferences their own", async () => {
    const set = await call(night, "PATCH", "/api/settings/preferences", { ecUnit: "ppm-700", wallSound: true });
    expect(set.status).toBe(200);
    try {
      expect((await call(night, "GET", "/api/settings/preferences")).json.preferences).toEqual({ ecUnit: "ppm-700", notifyEmail: true, wallSound: true });
      expect(((await call(grower, "GET", "/api/settings/preferences")).json.preferences as { ecUnit: string }).ecUnit).toBe("mS/cm");
    } finally {
      await call(night, "PATCH", "/api/settings/preferences", { ecUnit: "mS/cm", wallSound: false });
    }
  });

  it("writes every change to the audit log, filterable", async () => {
    const r = await call(owner, "GET", `/api/settings/audit?entity=probe`);
    const entries = r.json.entries as { action: string; entityId: number; userName: string }[];
    expect(entries.map((e) => e.action)).toEqual(expect.arrayContaining(["probe.add", "probe.move", "probe.retire", "probe.replace"]));
    expect(new Set(entries.map((e) => e.userName))).toContain("Tomas Reyes");
    const devices = (await call(owner, "GET", `/api/settings/audit?action=device.`)).json.entries as { action: string }[];
    expect(devices.map((e) => e.action)).toEqual(expect.arrayContaining(["device.register", "device.rotate", "device.revoke"]));
    expect((await call(grower, "GET", "/api/settings/audit")).status).toBe(403);
  });

  it("exports a tank's readings and the calibration record as CSV", async () => {
    const to = Date.now();
    const from = to - 86_400_000;
    const readings = await call(owner, "GET", `/api/exports/readings?tank=${made.tankId}&from=${from}&to=${to + 60_000}`);
    expect(readings.status).toBe(200);
    expect(readings.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(readings.headers.get("content-disposition")).toMatch(/attachment; filename="readings-c1-cucumber-/);
    const lines = readings.text.trim().split("\r\n");
    expect(lines[0]).toBe("time_utc,ts_ms,probe_serial,measure,raw,raw_unit,value,unit,quality,calibration_run_id");
    expect(lines.some((l) => l.includes(`PH-${RUN},ph,35,mV`))).toBe(true);

    const seeded = (await call(owner, "GET", "/api/settings/tanks")).json.tanks as { id: number; name: string }[];
    const l1 = seeded.find((t) => t.name === "L1 Butterhead")!;
    const big = await call(owner, "GET", `/api/exports/readings?tank=${l1.id}&from=${to - 30 * 86_400_000}&to=${to}`);
    // 30 days at five-minute steps, three probes (the seeded history), in pages of 5000.
    expect(big.text.trim().split("\r\n").length).toBeGreaterThan(3 * 8000);

    const cal = await call(owner, "GET", `/api/exports/calibrations?from=${to - 365 * 86_400_000}&to=${to}`);
    expect(cal.status).toBe(200);
    const rows = cal.text.trim().split("\r\n");
    expect(rows[0]).toMatch(/^run_id,site,tank,probe_serial,measure,status/);
    expect(rows.some((r) => r.includes(",rejected,") && r.toLowerCase().includes("slope"))).toBe(true);
    expect(rows.some((r) => r.includes("tech-7.00 lot "))).toBe(true);

    const stranger = await new HttpSession(baseURL).signIn(OTHER_ORG_USER.email, OTHER_ORG_USER.password);
    expect((await call(stranger, "GET", `/api/exports/readings?tank=${l1.id}&from=${from}&to=${to}`)).status).toBe(404);
    expect((await call(grower, "GET", `/api/exports/readings?tank=${l1.id}&from=${from}&to=${to}`)).status).toBe(403);
  });
});
