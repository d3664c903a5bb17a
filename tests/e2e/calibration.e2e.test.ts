// A grower calibrates a tank's pH and EC probes in Chromium, against the simulator: the demo
// button places the simulated probe in each buffer, the ingest stores its raw signal, the run
// page polls the live reading until it is stable and captures it. The first pH attempt is
// rejected (the probe was left in the pH 7 buffer for the pH 4 point) and retried; after saving,
// the ingest corrects new readings with the new calibration.
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Client } from "@libsql/client";
import { phFromMv } from "@/lib/calibration";
import { launch, shot, signInAs } from "./browser";
import { sessionFor } from "./session";
import { openStackDb } from "./database";

const STABLE_WAIT_MS = 180_000;

describe("guided calibration", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let db: Client;
  let tank: { id: number; ph: number; ec: number };

  beforeAll(async () => {
    browser = await launch();
    db = openStackDb();
    const t = await db.execute("SELECT id FROM tanks WHERE name = 'L1 Butterhead'");
    const id = Number(t.rows[0].id);
    const probes = await db.execute({ sql: "SELECT id, kind FROM probes WHERE tank_id = ?", args: [id] });
    const of = (k: string) => Number(probes.rows.find((r) => r.kind === k)!.id);
    tank = { id, ph: of("ph"), ec: of("ec") };
  });
  afterAll(async () => {
    // Even after a failure, L1 must not stay held (or a run stay open) for later test files.
    if (db && tank) {
      const grower = await sessionFor(baseURL, "grower");
      const post = (path: string) => grower.fetch(path, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" });
      const open = await db.execute({ sql: "SELECT id FROM calibration_runs WHERE tank_id = ? AND status = 'in_progress'", args: [tank.id] });
      for (const r of open.rows) expect((await post(`/api/calibrations/runs/${r.id}/abandon`)).ok).toBe(true);
      const held = await db.execute({ sql: "SELECT id FROM holds WHERE tank_id = ? AND released_at IS NULL", args: [tank.id] });
      for (const h of held.rows) expect((await post(`/api/holds/${h.id}/release`)).ok).toBe(true);
    }
    await browser?.close();
    db?.close();
  });

  /** Waits for what the page should show; on failure keeps a screenshot and the page's refusal, if any. */
  async function expectShown(page: Page, what: Promise<unknown>, label: string) {
    try {
      await what;
    } catch (err) {
      await shot(page, "calibration-failure").catch(() => undefined);
      const alerts = await page.getByRole("alert").allTextContents().catch(() => []);
      const shown = alerts.map((a) => a.trim()).filter(Boolean);
      throw new Error(`${label} did not show${shown.length ? `; the page said: ${shown.join(" | ")}` : ""} (test-results/screenshots/calibration-failure.png)`, { cause: err });
    }
  }

  const step = (page: Page, key: string) => expectShown(page, page.locator(`[data-current-step="${key}"]`).waitFor({ timeout: 30_000 }), `The ${key} step`);
  const runId = (page: Page) => Number(new URL(page.url()).pathname.split("/").pop());

  /** Places the simulated probe in this step's buffer; when the buffer changes, waits for the jump to show. */
  async function place(page: Page, changes: boolean) {
    await page.getByRole("button", { name: /Demo: place the simulated probe/ }).click();
    if (changes) await expectShown(page, page.locator('[data-stability="settling"]').waitFor({ timeout: 60_000 }), "The settling reading");
  }

  async function capture(page: Page, bottle?: { lot: string; expiresOn: string }) {
    await expectShown(page, page.locator('[data-stability="stable"]').waitFor({ timeout: STABLE_WAIT_MS }), "A stable reading");
    if (bottle) {
      await page.locator("input[name=lot]").fill(bottle.lot);
      await page.locator("input[name=expiresOn]").fill(bottle.expiresOn);
    }
    await page.getByRole("button", { name: "Capture this reading" }).click();
  }

  const B7 = { lot: "B7-2611-17", expiresOn: "2027-09-30" };
  const B4 = { lot: "B4-2611-18", expiresOn: "2027-09-30" };

  it("runs a two-point pH calibration (rejected once, retried) and an EC calibration", { timeout: 900_000 }, async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    let page = await context.newPage();
    await signInAs(page, baseURL, "grower");

    // From the tank page's entry point.
    await page.goto(`${baseURL}/tanks/${tank.id}`);
    await page.getByRole("link", { name: "Calibrate" }).click();
    await page.waitForURL(/\/calibrations\/new\?tank=/);
    await page.getByTestId("safety-cautions").waitFor();
    await shot(page, "calibration-01-start");
    await page.getByRole("button", { name: "Start the calibration run" }).click();
    await page.waitForURL(/\/calibrations\/runs\/\d+$/);
    const firstRun = runId(page);
    const hold = await db.execute({ sql: "SELECT reason FROM holds WHERE tank_id = ? AND released_at IS NULL", args: [tank.id] });
    expect(hold.rows[0].reason).toBe("Calibration run");

    // Attempt 1. As-found check in the pH 7 buffer with the calibration in force.
    await step(page, "as-found");
    await place(page, true);
    await page.locator('[data-stability="settling"]').waitFor();
    await shot(page, "calibration-02-as-found-settling");
    await capture(page, B7);
    await step(page, "clean");
    await shot(page, "calibration-03-clean");
    await page.getByRole("button", { name: "Done: the probe is clean and rinsed" }).click();

    // Point 1, pH 7: an expired bottle is refused with the reason.
    await step(page, "point");
    await place(page, false);
    await capture(page, { lot: "B7-OLD", expiresOn: "2026-11-01" });
    await page.getByRole("alert").filter({ hasText: "expired on 2026-11-01" }).waitFor();
    await shot(page, "calibration-04-expired-buffer");
    await page.locator("input[name=expiresOn]").fill(B7.expiresOn);
    await page.locator("input[name=lot]").fill(B7.lot);
    await page.getByRole("button", { name: "Capture this reading" }).click();
    await page.getByRole("heading", { name: /Buffer 2 of 2/ }).waitFor();

    // Point 2, pH 4, but the probe is left in the pH 7 buffer: the fit is rejected with the reason.
    await capture(page, B4);
    await step(page, "result");
    await page.locator('[data-verdict="rejected"]').waitFor();
    expect(await page.getByTestId("reasons").textContent()).toMatch(/below the 90 % minimum/);
    await shot(page, "calibration-05-rejected");
    await page.getByRole("button", { name: "Record the rejection" }).click();
    await step(page, "finished");
    await page.getByRole("button", { name: "Retry after cleaning" }).waitFor();
    await shot(page, "calibration-06-retry");

    // Attempt 2, on the same hold.
    await page.getByRole("button", { name: "Retry after cleaning" }).click();
    await page.waitForURL((u) => /\/calibrations\/runs\/\d+$/.test(u.pathname) && runId(page) !== firstRun);
    await step(page, "as-found");
    await place(page, false);
    await capture(page, B7);
    await step(page, "clean");
    await page.getByRole("button", { name: "Done: the probe is clean and rinsed" }).click();
    await step(page, "point");
    // The browser is closed midway: the run resumes at the same step from the calibrations page.
    await page.close();
    page = await context.newPage();
    await page.goto(`${baseURL}/calibrations`);
    await page.getByTestId("runs-in-progress").getByRole("link", { name: /Resume: pH/ }).click();
    await step(page, "point");
    await page.getByRole("heading", { name: /Buffer 1 of 2/ }).waitFor();
    await capture(page, B7);
    await page.getByRole("heading", { name: /Buffer 2 of 2/ }).waitFor();
    await place(page, true);
    await shot(page, "calibration-07-point-settling");
    await capture(page, B4);
    await step(page, "result");
    await page.locator('[data-verdict="accepted"]').waitFor();
    await shot(page, "calibration-08-accepted-preview");
    await page.getByRole("button", { name: "Save calibration" }).click();
    await step(page, "finished");
    await page.getByRole("heading", { name: "Calibration saved" }).waitFor();
    await shot(page, "calibration-09-saved");
    const phRun = runId(page);
    await page.getByRole("button", { name: /put the simulated probe back in the tank/ }).click();

    const saved = await db.execute({ sql: "SELECT status, effective_at, slope_pct, offset_mv FROM calibration_runs WHERE id = ?", args: [phRun] });
    const cal = { slopePct: Number(saved.rows[0].slope_pct), offsetMv: Number(saved.rows[0].offset_mv) };
    expect(saved.rows[0].status).toBe("accepted");
    expect(cal.slopePct).toBeGreaterThan(90);
    const first = await db.execute({ sql: "SELECT status, reasons FROM calibration_runs WHERE id = ?", args: [firstRun] });
    expect(first.rows[0].status).toBe("rejected");

    // The readings after saving are corrected by the ingest with the new calibration.
    const effectiveAt = Number(saved.rows[0].effective_at);
    await expect
      .poll(async () => Number((await db.execute({ sql: "SELECT count(*) AS n FROM readings WHERE probe_id = ? AND ts > ? AND calibration_run_id = ?", args: [tank.ph, effectiveAt + 2000, phRun] })).rows[0].n), { timeout: 60_000, interval: 1000 })
      .toBeGreaterThan(3);
    const after = await db.execute({
      sql: `SELECT r.raw, r.value, (SELECT t.value FROM readings t JOIN probes tp ON tp.id = t.probe_id WHERE tp.tank_id = ? AND tp.kind = 'temp' AND t.ts <= r.ts ORDER BY t.ts DESC LIMIT 1) AS temp
              FROM readings r WHERE r.probe_id = ? AND r.ts > ? AND r.calibration_run_id = ? ORDER BY r.ts DESC LIMIT 3`,
      args: [tank.id, tank.ph, effectiveAt + 2000, phRun],
    });
    for (const r of after.rows) expect(Number(r.value)).toBeCloseTo(phFromMv(Number(r.raw), Number(r.temp), cal), 2);

    // EC: the tank is still on hold for the run.
    await page.goto(`${baseURL}/calibrations/new?tank=${tank.id}&probe=${tank.ec}`);
    await page.getByRole("button", { name: "Start the calibration run" }).click();
    await page.waitForURL(/\/calibrations\/runs\/\d+$/);
    await step(page, "as-found");
    await place(page, true);
    await capture(page);
    await step(page, "clean");
    await page.getByRole("button", { name: "Done: the probe is clean and rinsed" }).click();
    await step(page, "point");
    await place(page, false);
    await capture(page, { lot: "K1413-2610-04", expiresOn: "2027-04-30" });
    await step(page, "result");
    await page.locator('[data-verdict="accepted"]').waitFor();
    await shot(page, "calibration-10-ec-result");
    await page.getByRole("button", { name: "Save calibration" }).click();
    await page.getByRole("heading", { name: "Calibration saved" }).waitFor();
    await page.getByRole("button", { name: /put the simulated probe back in the tank/ }).click();

    // The probe record shows the history, the trend, drift and next due date.
    await page.goto(`${baseURL}/probes/${tank.ph}`);
    await page.locator(`[data-run="${phRun}"][data-run-status="accepted"]`).waitFor();
    await page.locator(`[data-run="${firstRun}"][data-run-status="rejected"]`).waitFor();
    expect(await page.getByTestId("probe-status").textContent()).toMatch(/Current/);
    await page.getByTestId("trend-chart").waitFor();
    await shot(page, "calibration-11-probe-record");
    await context.close();
  });

  it("lets the night manager follow a run but not change it", async () => {
    const last = await db.execute("SELECT id FROM calibration_runs ORDER BY id DESC LIMIT 1");
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 2 });
    const page = await context.newPage();
    await signInAs(page, baseURL, "night_manager");
    await page.goto(`${baseURL}/calibrations/runs/${last.rows[0].id}`);
    await page.getByText("View only").waitFor();
    expect(await page.getByRole("button", { name: "Retry after cleaning" }).count()).toBe(0);
    await shot(page, "calibration-12-night-view-phone");
    const night = await sessionFor(baseURL, "night_manager");
    const res = await night.fetch("/api/calibrations/runs", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ tankId: tank.id, probeId: tank.ph }) });
    expect(res.status).toBe(403);
    await context.close();
  });

  it("shows the owner compliance per site", async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "owner");
    await page.goto(`${baseURL}/calibrations`);
    await page.getByTestId("compliance").waitFor();
    expect(await page.locator("[data-site]").count()).toBe(2);
    await shot(page, "calibration-13-compliance");
    await context.close();
  });
});
