// In the greenhouse: QR labels that lead to the right calibration run, calibration report PDFs
// whose text matches the database, a guided run that survives a dropped connection, and the
// phone layouts (390 × 844) of the run, the hold dialog and the incident page.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import type { Client } from "@libsql/client";
import jsQR from "jsqr";
import { PNG } from "pngjs";
import { DEMO_PASSWORD } from "@/db/seed/scenario";
import { RUN_STATUS_WORD, reportDateTime, runResultText } from "@/lib/reports/format";
import { SCREENSHOTS, launch, shot, signInAs } from "./browser";
import { demoEmail, sessionFor, type HttpSession } from "./session";
import { ROOT } from "./stack";
import { openStackDb } from "./database";

const OUT = path.join(ROOT, "test-results", "greenhouse");
const PHONE = { viewport: { width: 390, height: 844 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true };
const STABLE_WAIT_MS = 180_000;

/** Reads a QR code from a PNG screenshot of it. */
function decodeQr(png: Buffer): string {
  const image = PNG.sync.read(png);
  const code = jsQR(new Uint8ClampedArray(image.data.buffer, image.data.byteOffset, image.data.length), image.width, image.height);
  if (!code) throw new Error("No QR code found in the screenshot");
  return code.data;
}

/** Every visible control inside `scope` smaller than 48 × 48 px (text links inside sentences excepted). */
async function smallTargets(page: Page, scope: string): Promise<string[]> {
  return page.evaluate((sel) => {
    const root = document.querySelector(sel);
    if (!root) return [`no ${sel}`];
    const controls = root.querySelectorAll<HTMLElement>(
      'button, select, textarea, a.inline-flex, a.flex, [role="button"], input:not([type="checkbox"]):not([type="radio"]):not([type="hidden"]), label:has(> input[type="checkbox"]), label:has(> input[type="radio"])',
    );
    const out: string[] = [];
    for (const el of controls) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0 || getComputedStyle(el).visibility === "hidden") continue;
      const wide = el.tagName === "BUTTON" || el.getAttribute("role") === "button" || el.tagName === "A";
      if (r.height < 47.5 || (wide && r.width < 47.5)) out.push(`${el.tagName.toLowerCase()} "${(el.textContent ?? el.getAttribute("aria-label") ?? "").trim().slice(0, 40)}" ${Math.round(r.width)}×${Math.round(r.height)}`);
    }
    return out;
  }, scope);
}

/** What the phone's screen shows (not the whole page): sticky bars sit where the grower sees them. */
async function phoneShot(page: Page, name: string) {
  fs.mkdirSync(SCREENSHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`) });
}

function pdfText(file: string): string {
  return execFileSync("pdftotext", ["-enc", "UTF-8", file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
}

describe("in the greenhouse", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let db: Client;
  let grower: HttpSession;
  const cleanupTanks = new Set<number>();

  beforeAll(async () => {
    fs.mkdirSync(OUT, { recursive: true });
    browser = await launch();
    db = openStackDb();
    grower = await sessionFor(baseURL, "grower");
  });
  afterAll(async () => {
    // Leave no run open and no tank held for later test files.
    if (db && grower) {
      const post = (p: string) => grower.fetch(p, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" });
      for (const tankId of cleanupTanks) {
        const open = await db.execute({ sql: "SELECT id FROM calibration_runs WHERE tank_id = ? AND status = 'in_progress'", args: [tankId] });
        for (const r of open.rows) await post(`/api/calibrations/runs/${r.id}/abandon`);
        const held = await db.execute({ sql: "SELECT id FROM holds WHERE tank_id = ? AND released_at IS NULL", args: [tankId] });
        for (const h of held.rows) await post(`/api/holds/${h.id}/release`);
      }
    }
    await browser?.close();
    db?.close();
  });

  async function probeOf(tankName: string, kind: "ph" | "ec") {
    const r = await db.execute({ sql: "SELECT p.id, p.serial, t.id AS tank_id FROM probes p JOIN tanks t ON t.id = p.tank_id WHERE t.name = ? AND p.kind = ?", args: [tankName, kind] });
    return { id: Number(r.rows[0].id), serial: String(r.rows[0].serial), tankId: Number(r.rows[0].tank_id) };
  }

  it("follows a probe label's QR code through sign-in to the right calibration run, and a tank label to its tank", async () => {
    const probe = await probeOf("P1 Lettuce plugs", "ph");
    cleanupTanks.add(probe.tankId);
    const site = await db.execute({ sql: "SELECT site_id FROM tanks WHERE id = ?", args: [probe.tankId] });
    const siteId = Number(site.rows[0].site_id);

    // The grower prints the site's labels from settings.
    const printer = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await printer.newPage();
    await signInAs(page, baseURL, "grower");
    await page.goto(`${baseURL}/settings`);
    await page.getByRole("link", { name: /Labels/ }).first().click();
    await page.waitForURL(/\/settings\/labels/);
    await page.goto(`${baseURL}/settings/labels?site=${siteId}&format=a4`);
    const label = page.locator(`[data-label="probe-${probe.id}"]`);
    await label.waitFor();
    expect(await label.textContent()).toContain(probe.serial);
    expect(await label.textContent()).toContain("P1 Lettuce plugs");
    await shot(page, "labels-a4");
    // The print rendering: A4 sheet and the label roll, as Chromium prints them.
    await page.emulateMedia({ media: "print" });
    await page.pdf({ path: path.join(OUT, "labels-a4.pdf"), preferCSSPageSize: true, printBackground: true });
    await page.goto(`${baseURL}/settings/labels?site=${siteId}&format=roll`);
    await page.locator(`[data-label="probe-${probe.id}"]`).waitFor();
    await page.pdf({ path: path.join(OUT, "labels-roll.pdf"), preferCSSPageSize: true, printBackground: true });
    await page.emulateMedia({ media: "screen" });
    await page.goto(`${baseURL}/settings/labels?site=${siteId}&format=a4`);

    // Scan: decode the QR image on the label itself.
    const probeUrl = decodeQr(await page.locator(`[data-label="probe-${probe.id}"] [data-qr]`).screenshot({ scale: "device" }));
    const tankUrl = decodeQr(await page.locator(`[data-label="tank-${probe.tankId}"] [data-qr]`).screenshot({ scale: "device" }));
    expect(probeUrl).toBe(`${baseURL}/go/probe/${probe.id}`);
    expect(tankUrl).toBe(`${baseURL}/go/tank/${probe.tankId}`);
    await printer.close();

    // A signed-out phone opens the probe's address: sign-in first, then back to start that probe's run.
    const phone = await browser.newContext(PHONE);
    const p = await phone.newPage();
    await p.goto(probeUrl);
    await p.waitForURL(/\/sign-in\?next=/);
    await p.getByLabel("E-mail").fill(demoEmail("grower"));
    await p.getByLabel("Password").fill(DEMO_PASSWORD);
    await p.getByRole("button", { name: "Sign in" }).click();
    await p.waitForURL(new RegExp(`/calibrations/new\\?tank=${probe.tankId}&probe=${probe.id}$`));
    expect(await p.locator(`input[name=probe]:checked`).count()).toBe(1);
    await p.getByRole("button", { name: "Start the calibration run" }).click();
    await p.waitForURL(/\/calibrations\/runs\/\d+$/);
    const runId = Number(new URL(p.url()).pathname.split("/").pop());
    const run = await db.execute({ sql: "SELECT probe_id, status FROM calibration_runs WHERE id = ?", args: [runId] });
    expect(Number(run.rows[0].probe_id)).toBe(probe.id);
    expect(run.rows[0].status).toBe("in_progress");

    // Scanning again (any phone) resumes that run rather than starting another.
    await p.goto(probeUrl);
    await p.waitForURL(`${baseURL}/calibrations/runs/${runId}`);
    await p.goto(tankUrl);
    await p.waitForURL(`${baseURL}/tanks/${probe.tankId}`);
    await phone.close();
    const post = (url: string) => grower.fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" });
    expect((await post(`/api/calibrations/runs/${runId}/abandon`)).ok).toBe(true);
    const held = await db.execute({ sql: "SELECT id FROM holds WHERE tank_id = ? AND released_at IS NULL", args: [probe.tankId] });
    for (const h of held.rows) expect((await post(`/api/holds/${h.id}/release`)).ok).toBe(true);

    // Night managers cannot print labels.
    const night = await browser.newContext();
    const n = await night.newPage();
    await signInAs(n, baseURL, "night_manager");
    await n.goto(`${baseURL}/settings/labels`);
    await n.waitForURL((u) => !u.pathname.startsWith("/settings/labels"));
    await night.close();
  });

  it("renders the probe and site calibration reports, and their text matches the database", async () => {
    const owner = await sessionFor(baseURL, "owner");
    const probe = await probeOf("G1 Genovese basil", "ph");
    const site = await db.execute({ sql: "SELECT s.id, s.name, s.time_zone FROM sites s JOIN tanks t ON t.site_id = s.id WHERE t.id = ?", args: [probe.tankId] });
    const siteId = Number(site.rows[0].id);
    const tz = String(site.rows[0].time_zone);
    const from = "2020-01-01";
    const to = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);

    const res = await owner.fetch(`/api/reports/probes/${probe.id}?from=${from}&to=${to}`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const probePdf = path.join(OUT, "probe-report.pdf");
    fs.writeFileSync(probePdf, Buffer.from(await res.arrayBuffer()));
    execFileSync("pdftoppm", ["-png", "-r", "80", probePdf, path.join(OUT, "probe-report")]);
    const text = pdfText(probePdf);
    expect(text).toContain(`pH probe ${probe.serial}`);
    expect(text).toContain("G1 Genovese basil");
    expect(text).toMatch(/accredited laboratory/);
    const runs = await db.execute({
      sql: "SELECT r.*, u.name AS user_name FROM calibration_runs r LEFT JOIN users u ON u.id = r.started_by WHERE r.probe_id = ? AND r.status != 'in_progress' ORDER BY r.started_at",
      args: [probe.id],
    });
    expect(runs.rows.length).toBeGreaterThan(0);
    for (const r of runs.rows) {
      expect(text).toContain(`Run ${r.id} · ${reportDateTime(Number(r.started_at), tz)}`);
      expect(text).toContain(RUN_STATUS_WORD[r.status as "accepted"]);
      if (r.status !== "abandoned") {
        expect(text).toContain(runResultText({ status: String(r.status), slopePct: r.slope_pct as number | null, offsetMv: r.offset_mv as number | null, cellConstant: r.cell_constant as number | null, deviationPct: r.deviation_pct as number | null }));
      }
      expect(text).toContain(`by ${r.user_name}`);
      for (const reason of JSON.parse(String(r.reasons)) as string[]) expect(text).toContain(reason.replace(/\s+/g, " "));
      const points = await db.execute({ sql: "SELECT * FROM calibration_points WHERE run_id = ?", args: [Number(r.id)] });
      for (const pt of points.rows) {
        if (pt.lot) expect(text).toContain(String(pt.lot));
        if (pt.expires_on) expect(text).toContain(String(pt.expires_on));
        if (pt.mv !== null) expect(text).toContain(Number(pt.mv).toFixed(1).replace(/^-0\.0$/, "0.0"));
      }
    }
    // Runs of another probe are not in this probe's record.
    const other = await db.execute({ sql: "SELECT id FROM calibration_runs WHERE probe_id != ? AND status != 'in_progress' LIMIT 1", args: [probe.id] });
    expect(text).not.toContain(`Run ${other.rows[0].id} ·`);

    const siteRes = await owner.fetch(`/api/reports/sites/${siteId}?from=${from}&to=${to}`);
    expect(siteRes.status).toBe(200);
    const sitePdf = path.join(OUT, "site-report.pdf");
    fs.writeFileSync(sitePdf, Buffer.from(await siteRes.arrayBuffer()));
    execFileSync("pdftoppm", ["-png", "-r", "80", sitePdf, path.join(OUT, "site-report")]);
    const siteText = pdfText(sitePdf);
    expect(siteText).toContain(String(site.rows[0].name));
    // The compliance figures, computed here from the database the report reads.
    const compliance = (await (await owner.fetch("/api/calibrations/compliance")).json()) as { sites: { site: { id: number }; probes: number; inDate: number; overdue: { serial: string }[] }[] };
    const c = compliance.sites.find((s) => s.site.id === siteId)!;
    expect(siteText).toContain(`(${c.inDate} of ${c.probes} current or due soon)`);
    for (const o of c.overdue) expect(siteText).toContain(o.serial);
    const replace = await db.execute({ sql: "SELECT p.serial FROM probes p JOIN tanks t ON t.id = p.tank_id WHERE t.site_id = ? AND p.status = 'replace'", args: [siteId] });
    if (replace.rows.length) for (const r of replace.rows) expect(siteText).toContain(String(r.serial));
    else expect(siteText).toContain("No probe is marked for replacement.");
    const perMonth = await db.execute({
      sql: `SELECT strftime('%Y-%m', r.started_at / 1000, 'unixepoch') AS month, sum(r.status = 'accepted') AS accepted, sum(r.status = 'rejected') AS rejected, sum(r.status = 'abandoned') AS abandoned
            FROM calibration_runs r JOIN tanks t ON t.id = r.tank_id WHERE t.site_id = ? AND r.status != 'in_progress' GROUP BY month`,
      args: [siteId],
    });
    for (const m of perMonth.rows) expect(siteText).toContain(`${m.month} ${m.accepted} accepted · ${m.rejected} rejected · ${m.abandoned} abandoned`);
    const siteRuns = await db.execute({ sql: "SELECT r.id, r.started_at FROM calibration_runs r JOIN tanks t ON t.id = r.tank_id WHERE t.site_id = ? AND r.status != 'in_progress'", args: [siteId] });
    for (const r of siteRuns.rows) expect(siteText).toContain(reportDateTime(Number(r.started_at), tz));

    // Downloadable from the probe page and the calibrations page.
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "owner");
    await page.goto(`${baseURL}/probes/${probe.id}`);
    const download = page.waitForEvent("download");
    await page.getByTestId("probe-report").getByRole("button", { name: "Download the PDF" }).click();
    expect((await download).suggestedFilename()).toMatch(new RegExp(`^tidewell-calibration-${probe.serial}-.+\\.pdf$`));
    await page.goto(`${baseURL}/calibrations`);
    const siteDownload = page.waitForEvent("download");
    await page.getByTestId(`site-report-${siteId}`).getByRole("button", { name: "Download the PDF" }).click();
    expect((await siteDownload).suggestedFilename()).toMatch(/^tidewell-calibration-.+\.pdf$/);
    await context.close();
  });

  it("keeps a point captured offline on the phone and saves the run once with all its points; phone layouts", { timeout: 600_000 }, async () => {
    const probe = await probeOf("G1 Genovese basil", "ph");
    cleanupTanks.add(probe.tankId);
    const started = await grower.fetch("/api/calibrations/runs", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ tankId: probe.tankId, probeId: probe.id, standards: ["tech-7.00", "tech-4.01"] }),
    });
    expect(started.status).toBe(201);
    const { runId } = (await started.json()) as { runId: number };

    const phone: BrowserContext = await browser.newContext(PHONE);
    const page = await phone.newPage();
    await signInAs(page, baseURL, "grower");
    await page.goto(`${baseURL}/calibrations/runs/${runId}`);
    const step = (key: string) => page.locator(`[data-current-step="${key}"]`).waitFor({ timeout: 30_000 });
    await step("as-found");
    await page.getByRole("button", { name: "Skip the as-found check" }).click();
    await step("clean");
    await page.getByRole("button", { name: "Done: the probe is clean and rinsed" }).click();
    await step("point");

    const capture = async (lot: string, offline: boolean) => {
      await page.getByRole("button", { name: /Demo: place the simulated probe/ }).click();
      await page.locator('[data-stability="stable"]').waitFor({ timeout: STABLE_WAIT_MS });
      await page.locator("input[name=lot]").fill(lot);
      await page.locator("input[name=expiresOn]").fill("2027-09-30");
      if (offline) await phone.setOffline(true);
      await page.getByRole("button", { name: "Capture this reading" }).click();
    };

    await capture("B7-2612-01", false);
    await page.getByRole("heading", { name: /Buffer 2 of 2/ }).waitFor();
    await page.evaluate(() => window.scrollTo(0, 0));
    await phoneShot(page, "phone-calibration-run");
    await shot(page, "phone-calibration-run-full");
    expect(await smallTargets(page, "[data-current-step]")).toEqual([]);

    // Another device (the owner's) follows the same run at the same step.
    const desk = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const deskPage = await desk.newPage();
    await signInAs(deskPage, baseURL, "owner");
    await deskPage.goto(`${baseURL}/calibrations/runs/${runId}`);
    await deskPage.getByRole("heading", { name: /Buffer 2 of 2/ }).waitFor();
    await desk.close();

    // The connection drops just as the grower captures the pH 4 point.
    await capture("B4-2612-02", true);
    await page.getByTestId("pending-point").waitFor();
    await page.getByTestId("offline-banner").waitFor();
    await page.getByTestId("pending-point").scrollIntoViewIfNeeded();
    await phoneShot(page, "phone-calibration-offline");
    const before = await db.execute({ sql: "SELECT count(*) AS n FROM calibration_points WHERE run_id = ?", args: [runId] });
    expect(Number(before.rows[0].n)).toBe(1);
    const offlineFor = Date.now();
    await page.waitForTimeout(3000);
    await phone.setOffline(false);
    await step("result");
    const points = await db.execute({ sql: "SELECT seq, lot, client_key, stable, captured_at FROM calibration_points WHERE run_id = ? ORDER BY seq", args: [runId] });
    expect(points.rows.map((r) => r.lot)).toEqual(["B7-2612-01", "B4-2612-02"]);
    // Judged as of the moment capture was pressed (before the connection returned), and stable.
    expect(Number(points.rows[1].captured_at)).toBeLessThanOrEqual(offlineFor + 1000);
    expect(Number(points.rows[1].stable)).toBe(1);
    const verdict = await page.locator("[data-verdict]").getAttribute("data-verdict");
    await page.getByRole("button", { name: verdict === "accepted" ? "Save calibration" : "Record the rejection" }).click();
    await step("finished");
    await phoneShot(page, "phone-calibration-finished");

    // A resend of the same point (its answer lost with the connection) saves nothing new.
    const resend = await grower.fetch(`/api/calibrations/runs/${runId}/points`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ purpose: "point", lot: "B4-2612-02", expiresOn: "2027-09-30", clientKey: String(points.rows[1].client_key), queuedMs: 0 }),
    });
    expect(resend.ok).toBe(true);
    const after = await db.execute({ sql: "SELECT count(*) AS n FROM calibration_points WHERE run_id = ?", args: [runId] });
    expect(Number(after.rows[0].n)).toBe(2);
    const saved = await db.execute({ sql: "SELECT status FROM calibration_runs WHERE id = ?", args: [runId] });
    expect(saved.rows[0].status).toBe(verdict);

    // Phone layouts: the hold dialog and an incident.
    const holdTank = await probeOf("P1 Lettuce plugs", "ph");
    await page.goto(`${baseURL}/tanks/${holdTank.tankId}`);
    await page.getByRole("button", { name: "Hold", exact: true }).first().click();
    await page.locator("dialog[open]").waitFor();
    await phoneShot(page, "phone-hold-dialog");
    expect(await smallTargets(page, "dialog[open]")).toEqual([]);
    await page.keyboard.press("Escape");
    const incident = await db.execute("SELECT id FROM incidents ORDER BY state = 'resolved', id LIMIT 1");
    await page.goto(`${baseURL}/incidents/${incident.rows[0].id}`);
    await page.locator("main h1").waitFor();
    await phoneShot(page, "phone-incident");
    await shot(page, "phone-incident-full");
    expect(await smallTargets(page, "main")).toEqual([]);
    await phone.close();
  });

  it("shows the tank wall and a tank page from the service worker's cache when offline, saying when they were last updated", async () => {
    const tank = await probeOf("L2 Oakleaf", "ph");
    const context = await browser.newContext(PHONE);
    const page = await context.newPage();
    await signInAs(page, baseURL, "night_manager");
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
    // Once the worker controls the page, visits are kept.
    await page.reload();
    await page.waitForFunction(() => navigator.serviceWorker.controller !== null);
    await page.goto(`${baseURL}/`);
    await page.getByText("L2 Oakleaf").first().waitFor();
    await page.goto(`${baseURL}/tanks/${tank.tankId}`);
    await page.locator("main h1").waitFor();
    const manifest = await (await page.request.get(`${baseURL}/manifest.webmanifest`)).json();
    expect(manifest.icons.map((i: { sizes: string }) => i.sizes)).toContain("512x512");

    await context.setOffline(true);
    await page.goto(`${baseURL}/`);
    // The time comes from the kept copy, read from the cache a moment after the banner shows.
    await page.getByTestId("offline-banner").filter({ hasText: /Offline — last updated at \d{1,2} \w{3} \d{4} \d{2}:\d{2}/ }).waitFor();
    await page.getByText("L2 Oakleaf").first().waitFor();
    await phoneShot(page, "phone-offline-wall");
    await page.goto(`${baseURL}/tanks/${tank.tankId}`);
    await page.getByTestId("offline-banner").waitFor();
    await page.locator("main h1", { hasText: "L2 Oakleaf" }).waitFor();
    await phoneShot(page, "phone-offline-tank");
    // A page the device never kept: the offline page.
    await page.goto(`${baseURL}/settings/preferences`);
    await page.getByRole("heading", { name: "No connection" }).waitFor();
    await phoneShot(page, "phone-offline-page");
    await context.setOffline(false);
    await context.close();
  });
});
