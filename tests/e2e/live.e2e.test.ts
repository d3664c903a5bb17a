// Live monitoring end to end: simulator → broker → ingest → web (SSE) → Chromium.
// The night manager watches the wall; a tank leaves its band and the wall shows it without a reload;
// the tank page charts draw and grow live; a dropped stream resumes without losing a reading.
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { connect, type MqttClient } from "mqtt";
import type { Client } from "@libsql/client";
import { SERVICE_ACCOUNTS, topics } from "@/ingest/topics";
import { STATE_RANK, type TankStateKind } from "@/lib/display/tank-state";
import { launch, shot, signInAs } from "./browser";
import { HttpSession, sessionFor } from "./session";
import { OTHER_ORG_USER } from "./fixtures";
import { openStackDb } from "./database";

interface SseMessage {
  id: string | null;
  event: string;
  data: unknown;
}

/** Reads a server-sent event stream until `done` says so (or the stream ends). */
async function readEvents(res: Response, done: (all: SseMessage[]) => boolean, controller: AbortController): Promise<SseMessage[]> {
  const all: SseMessage[] = [];
  const reader = res.body!.getReader();
  const decoder = new TextDecoder();
  let buffer = "";
  try {
    while (!done(all)) {
      const { value, done: ended } = await reader.read();
      if (ended) break;
      buffer += decoder.decode(value, { stream: true });
      let cut: number;
      while ((cut = buffer.indexOf("\n\n")) !== -1) {
        const block = buffer.slice(0, cut);
        buffer = buffer.slice(cut + 2);
        const msg: SseMessage = { id: null, event: "message", data: null };
        for (const line of block.split("\n")) {
          if (line.startsWith("id: ")) msg.id = line.slice(4);
          else if (line.startsWith("event: ")) msg.event = line.slice(7);
          else if (line.startsWith("data: ")) msg.data = JSON.parse(line.slice(6));
        }
        if (msg.data !== null) all.push(msg);
      }
    }
  } catch (err) {
    // Aborted by the caller: what arrived until then is the answer.
    if (!controller.signal.aborted) throw err;
  } finally {
    controller.abort();
  }
  return all;
}

/** The wall's tiles run from the worst state to the best (lib/display/tank-state STATE_RANK). */
async function expectWorstFirst(page: Page) {
  await expect
    .poll(async () => {
      const ranks = (await page.locator("[data-tank]").evaluateAll((els) => els.map((e) => e.getAttribute("data-tank-state")))).map((s) => STATE_RANK[s as TankStateKind]);
      return ranks.every((r, i) => i === 0 || ranks[i - 1] <= r);
    }, { timeout: 10_000 })
    .toBe(true);
}

type Readings = { tankId: number; readings: { probeId: number; ts: number }[] };
const readingsOf = (all: SseMessage[], tankId: number) =>
  all.filter((m) => m.event === "readings" && (m.data as Readings).tankId === tankId).flatMap((m) => (m.data as Readings).readings);

describe("live monitoring", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let db: Client;
  let mq: MqttClient;
  let tank: { id: number; controllerId: string; phProbe: number };

  beforeAll(async () => {
    browser = await launch();
    db = openStackDb();
    const row = (
      await db.execute(
        "SELECT t.id, t.controller_id, p.id AS probe FROM tanks t JOIN probes p ON p.tank_id = t.id AND p.kind = 'ph' AND p.status = 'active' WHERE t.name = 'G1 Genovese basil'",
      )
    ).rows[0];
    tank = { id: Number(row.id), controllerId: String(row.controller_id), phProbe: Number(row.probe) };
    mq = connect(inject("mqttUrl"), { username: SERVICE_ACCOUNTS.web.username, password: SERVICE_ACCOUNTS.web.password(), clientId: `tidewell-web-e2e-live-${process.pid}` });
    await new Promise<void>((resolve, reject) => {
      mq.once("connect", () => resolve());
      mq.once("error", reject);
    });
  });

  afterAll(async () => {
    if (mq?.connected) await mq.publishAsync(topics.simControl(tank.controllerId), JSON.stringify({ v: 1, fault: "none" }), { qos: 1 });
    await mq?.endAsync();
    db?.close();
    await browser?.close();
  });

  it("streams readings of the organisation and resumes after a drop without losing one", async () => {
    const night = await sessionFor(baseURL, "night_manager");
    const first = new AbortController();
    const res = await night.fetch("/api/stream", { headers: { accept: "text/event-stream" }, signal: first.signal });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/event-stream");
    const before = await readEvents(res, (all) => readingsOf(all, tank.id).filter((r) => r.probeId === tank.phProbe).length >= 3, first);
    expect(before[0].event).toBe("ready");
    const ids = before.filter((m) => m.id !== null).map((m) => Number(m.id));
    expect(ids).toEqual([...ids].sort((a, b) => a - b)); // ids never go down
    const lastId = ids[ids.length - 1];

    // Away for a while: the simulator keeps publishing and the ingest keeps storing.
    await new Promise((r) => setTimeout(r, 4000));
    const reopenedAt = Date.now();
    const second = new AbortController();
    const again = await night.fetch("/api/stream", { headers: { accept: "text/event-stream", "last-event-id": String(lastId) }, signal: second.signal });
    const after = await readEvents(again, (all) => readingsOf(all, tank.id).some((r) => r.probeId === tank.phProbe && r.ts > reopenedAt + 1000), second);
    expect(after.find((m) => m.event === "ready")!.data).toMatchObject({ resumed: true });
    expect(after.some((m) => m.event === "backfill")).toBe(true);

    const seen = new Set([...readingsOf(before, tank.id), ...readingsOf(after, tank.id)].filter((r) => r.probeId === tank.phProbe).map((r) => r.ts));
    const firstTs = Math.min(...seen);
    const lastTs = Math.max(...seen);
    const stored = await db.execute({ sql: "SELECT ts FROM readings WHERE probe_id = ? AND ts BETWEEN ? AND ? ORDER BY ts", args: [tank.phProbe, firstTs, lastTs] });
    const missed = stored.rows.map((r) => Number(r.ts)).filter((ts) => !seen.has(ts));
    expect(stored.rows.length).toBeGreaterThan(5);
    expect(missed, "readings stored while the stream was away and never delivered").toEqual([]);
  });

  it("keeps another organisation's readings out of its stream", async () => {
    const other = await new HttpSession(baseURL).signIn(OTHER_ORG_USER.email, OTHER_ORG_USER.password);
    const scoped = await other.fetch(`/api/stream?tank=${tank.id}`, { headers: { accept: "text/event-stream" } });
    expect(scoped.status).toBe(404);

    const night = await sessionFor(baseURL, "night_manager");
    const otherAbort = new AbortController();
    const nightAbort = new AbortController();
    const otherRes = await other.fetch("/api/stream", { headers: { accept: "text/event-stream" }, signal: otherAbort.signal });
    let nightDone = false;
    const otherEvents = readEvents(otherRes, () => nightDone, otherAbort);
    const nightRes = await night.fetch("/api/stream", { headers: { accept: "text/event-stream" }, signal: nightAbort.signal });
    // Once this farm's own stream has carried a few batches, the other farm's must have carried none.
    const own = await readEvents(nightRes, (all) => all.filter((m) => m.event === "readings").length >= 10, nightAbort);
    expect(own.filter((m) => m.event === "readings").length).toBeGreaterThanOrEqual(10);
    nightDone = true;
    otherAbort.abort();
    const got = await otherEvents;
    expect(got.filter((m) => m.event === "readings")).toEqual([]);
  });

  it("shows the night manager a tank leaving its band, worst first, without a reload", async () => {
    const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "night_manager");
    await page.goto(`${baseURL}/?display=wall`);
    await page.locator('[data-live-status="live"]').waitFor({ timeout: 30_000 });
    const tile = page.locator(`[data-tank="${tank.id}"]`);
    await expect.poll(() => tile.locator('[data-measure="ph"]').getAttribute("data-measure-state"), { timeout: 30_000 }).toBe("in-band");
    await page.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));

    await mq.publishAsync(topics.simControl(tank.controllerId), JSON.stringify({ v: 1, fault: "out-of-band", measure: "ph" }), { qos: 1 });

    await expect.poll(() => tile.locator('[data-measure="ph"]').getAttribute("data-measure-state"), { timeout: 60_000, interval: 500 }).toMatch(/^(high|low)$/);
    await expect.poll(() => tile.getAttribute("data-tank-state"), { timeout: 30_000 }).toMatch(/^(out-of-band|incident)$/);
    await expectWorstFirst(page);
    expect(await page.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(true);
    // The wall display covers the app's navigation: what sits where the side bar was is the wall.
    expect(await page.evaluate(() => document.elementFromPoint(40, 300)?.closest("[data-display=wall]") !== null)).toBe(true);
    await shot(page, "live-wall-1920");
    await context.close();

    const phone = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 2 });
    const phonePage = await phone.newPage();
    await signInAs(phonePage, baseURL, "night_manager");
    await phonePage.locator('[data-live-status="live"]').waitFor({ timeout: 30_000 });
    await expect.poll(() => phonePage.locator(`[data-tank="${tank.id}"]`).getAttribute("data-tank-state"), { timeout: 30_000 }).toMatch(/^(out-of-band|incident)$/);
    await expectWorstFirst(phonePage);
    expect(await phonePage.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await shot(phonePage, "live-wall-phone");
    await phone.close();
  });

  it("draws the tank's charts and appends live readings to them", async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "night_manager");
    await page.goto(`${baseURL}/tanks/${tank.id}`);
    // Wait for the 1 h series itself, so the count below is not the default 24 h view's.
    const oneHour = page.waitForResponse((r) => {
      const u = new URL(r.url());
      return u.pathname === `/api/tanks/${tank.id}/series` && r.ok() && Number(u.searchParams.get("to")) - Number(u.searchParams.get("from")) <= 3_660_000;
    });
    await page.getByRole("button", { name: "1 h", exact: true }).click();
    await oneHour;
    const ph = page.locator('[data-chart="pH"] [data-points]');
    await expect.poll(async () => Number(await ph.getAttribute("data-points")), { timeout: 30_000 }).toBeGreaterThan(0);
    await page.waitForTimeout(500); // let the chart take the 1 h data
    const drawn = Number(await ph.getAttribute("data-points"));
    await expect.poll(async () => Number(await ph.getAttribute("data-points")), { timeout: 30_000, interval: 500 }).toBeGreaterThan(drawn);
    expect(await page.locator('[data-chart="pH"] canvas').count()).toBeGreaterThan(0);

    const box = (await page.locator('[data-chart="pH"] .u-over').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.9, box.y + box.height / 2);
    await expect.poll(() => page.locator('[data-chart="pH"] [data-testid="chart-readout"]').textContent()).toMatch(/quality (ok|held|uncalibrated|lapsed|suspect)/);
    await shot(page, "live-tank-charts");

    await page.getByRole("button", { name: "30 d", exact: true }).click();
    await expect.poll(() => page.getByTestId("series-meta").textContent(), { timeout: 30_000 }).toContain("hourly summaries");
    await expect.poll(async () => Number(await ph.getAttribute("data-points")), { timeout: 30_000 }).toBeGreaterThan(100);
    await shot(page, "live-tank-charts-30d");
    await context.close();
  });
});
