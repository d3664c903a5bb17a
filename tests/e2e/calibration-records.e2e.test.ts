// Calibration records entered by hand in Chromium: a calibration done elsewhere with its
// certificate (type checked by content, not name), a buffer's certificate table typed on screen,
// a spot check past tolerance, a CSV of spot checks that imports nothing until every row is
// right, and a spot check corrected and deleted.
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Client } from "@libsql/client";
import { launch, shot, signInAs } from "./browser";
import { HttpSession, sessionFor } from "./session";
import { OTHER_ORG_USER } from "./fixtures";
import { openStackDb } from "./database";

const PNG = Buffer.from("89504e470d0a1a0a0000000d4948445200000001000000010806000000", "hex");

describe("calibration records entered by hand", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let db: Client;
  let probe: { id: number; serial: string };

  beforeAll(async () => {
    browser = await launch();
    db = openStackDb();
    const r = await db.execute("SELECT p.id, p.serial FROM probes p JOIN tanks t ON t.id = p.tank_id WHERE t.name = 'L2 Oakleaf' AND p.kind = 'ph'");
    probe = { id: Number(r.rows[0].id), serial: String(r.rows[0].serial) };
  });
  afterAll(async () => {
    await browser?.close();
    db?.close();
  });

  it("records a calibration done elsewhere with its certificate", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "grower");
    await page.goto(`${baseURL}/calibrations`);
    await page.getByRole("link", { name: "Enter one done elsewhere" }).click();
    await page.waitForURL(/\/calibrations\/manual$/);
    await page.getByLabel("Probe").selectOption(String(probe.id));
    await page.locator("input[name=slopePct]").fill("97.5");
    await page.locator("input[name=offsetMv]").fill("3.2");
    await page.getByLabel("Lot").fill("M7-0412");
    await page.getByLabel("Expiry date").fill("2027-05-01");
    await page.getByLabel(/Note/).fill("Handheld meter, morning round");
    // A file named .pdf that is not a PDF is refused by its content.
    await page.getByLabel(/Buffer certificate/).setInputFiles({ name: "certificate.pdf", mimeType: "application/pdf", buffer: Buffer.from("just some text, not a PDF") });
    await page.getByRole("button", { name: "Save the calibration record" }).click();
    await page.getByRole("alert").filter({ hasText: "Only PDF, PNG and JPEG" }).waitFor();
    await shot(page, "calibration-20-manual-refused-file");
    await page.getByLabel(/Buffer certificate/).setInputFiles({ name: "certificate.png", mimeType: "image/png", buffer: PNG });
    await page.getByRole("button", { name: "Save the calibration record" }).click();
    await page.getByText("Recorded and accepted").waitFor();
    await shot(page, "calibration-21-manual-saved");

    const run = await db.execute({ sql: "SELECT id, source, status, upload_id FROM calibration_runs WHERE probe_id = ? ORDER BY id DESC LIMIT 1", args: [probe.id] });
    expect(run.rows[0].source).toBe("manual");
    expect(run.rows[0].upload_id).not.toBeNull();
    const runId = Number(run.rows[0].id);
    const grower = await sessionFor(baseURL, "grower");
    const cert = await grower.fetch(`/api/calibrations/runs/${runId}/certificate`);
    expect(cert.status).toBe(200);
    expect(cert.headers.get("content-type")).toBe("image/png");
    expect(Buffer.from(await cert.arrayBuffer()).equals(PNG)).toBe(true);
    const other = await new HttpSession(baseURL).signIn(OTHER_ORG_USER.email, OTHER_ORG_USER.password);
    expect((await other.fetch(`/api/calibrations/runs/${runId}/certificate`)).status).toBe(404);

    await page.goto(`${baseURL}/probes/${probe.id}`);
    await page.locator(`[data-run="${runId}"]`).getByText("entered by hand").waitFor();
    await page.getByRole("link", { name: "certificate.png" }).waitFor();
    await context.close();
  });

  it("takes a buffer's certificate table on screen, with field errors until it is right", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 1100 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "grower");

    // The guided run's form: an unfinished table is refused on screen, and no run starts.
    const tank = await db.execute("SELECT id FROM tanks WHERE name = 'L2 Oakleaf'");
    const runsBefore = Number((await db.execute("SELECT count(*) AS n FROM calibration_runs")).rows[0].n);
    await page.goto(`${baseURL}/calibrations/new?tank=${Number(tank.rows[0].id)}`);
    await page.getByRole("radio", { name: /pH/ }).check();
    await page.getByRole("combobox", { name: "Second buffer" }).selectOption({ label: "Own table from a certificate" });
    const runTable = page.locator('[data-buffer-table="Second buffer"]');
    await runTable.getByLabel("Row 1 pH").fill("4.00");
    await page.getByRole("button", { name: "Start the calibration run" }).click();
    await runTable.getByText("Enter the pH").first().waitFor();
    await page.getByRole("alert").filter({ hasText: "Second buffer: Row 2 of the buffer table: Enter the pH" }).waitFor();
    await shot(page, "calibration-19-run-certificate-table-errors");
    expect(Number((await db.execute("SELECT count(*) AS n FROM calibration_runs")).rows[0].n)).toBe(runsBefore);

    // The manual entry form: errors under the fields, then saved once right.
    await page.goto(`${baseURL}/calibrations/manual`);
    await page.getByLabel("Probe").selectOption(String(probe.id));
    await page.locator("input[name=slopePct]").fill("98.1");
    await page.locator("input[name=offsetMv]").fill("-2.4");
    await page.getByLabel("Buffer or standard").selectOption({ label: "Own table from a certificate" });
    const table = page.locator('[data-buffer-table="Buffer 1"]');
    for (const [i, t, ph] of [[1, "15", "7.04"], [2, "20", "7.02"], [3, "20", "7.00"], [4, "30", "69.9"]] as const) {
      await table.getByLabel(`Row ${i} temperature °C`).fill(t);
      await table.getByLabel(`Row ${i} pH`).fill(ph);
    }
    await page.getByLabel("Lot").fill("CT-2291");
    await page.getByLabel("Expiry date").fill("2027-08-01");
    await page.getByLabel("Temperature °C", { exact: true }).fill("22");
    await page.getByRole("button", { name: "Save the calibration record" }).click();
    await table.getByText("20 °C is listed twice; keep one row per temperature").waitFor();
    await table.getByText("Between pH 0 and 14; check the certificate").waitFor();
    expect(await table.locator("[aria-invalid=true]").count()).toBe(2);
    await shot(page, "calibration-20b-certificate-table-errors");
    await table.getByLabel("Row 3 temperature °C").fill("25");
    await table.getByLabel("Row 4 pH").fill("6.99");
    await page.getByRole("button", { name: "Save the calibration record" }).click();
    await page.getByText("Recorded and accepted").waitFor();
    const point = await db.execute({
      sql: "SELECT cp.standard, cp.expected FROM calibration_points cp JOIN calibration_runs r ON r.id = cp.run_id WHERE r.probe_id = ? ORDER BY cp.id DESC LIMIT 1",
      args: [probe.id],
    });
    expect(JSON.parse(String(point.rows[0].standard))).toEqual({ points: [[15, 7.04], [20, 7.02], [25, 7], [30, 6.99]] });
    expect(Number(point.rows[0].expected)).toBeCloseTo(7.012, 6); // 22 °C, linear between 20 and 25 °C
    await context.close();
  });

  it("flags a spot check past the tank's tolerance and imports a CSV all or nothing", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "grower");
    await page.goto(`${baseURL}/calibrations/spot-checks?probe=${probe.id}`);
    await page.locator("input[name=meterValue]").fill("8.4");
    await page.getByRole("button", { name: "Compare with Tidewell" }).click();
    await page.locator('[data-testid="spot-verdict"][data-past-tolerance="true"]').waitFor();
    expect(await page.getByTestId("spot-verdict").textContent()).toMatch(/recalibrate this probe/);
    await shot(page, "calibration-22-spot-check-past-tolerance");

    const now = new Date().toISOString().slice(0, 16);
    const bad = `probe,taken_at,value\n${probe.serial},${now}Z,6.1\nNOT-A-PROBE,${now}Z,6.0\n${probe.serial},tomorrow,6.0\n`;
    const before = Number((await db.execute({ sql: "SELECT count(*) AS n FROM spot_checks WHERE probe_id = ?", args: [probe.id] })).rows[0].n);
    await page.getByLabel("CSV file").setInputFiles({ name: "readings.csv", mimeType: "text/csv", buffer: Buffer.from(bad) });
    await page.getByRole("button", { name: "Import the readings" }).click();
    await page.getByTestId("import-errors").waitFor();
    expect(await page.getByTestId("import-errors").textContent()).toMatch(/row 3.*NOT-A-PROBE[\s\S]*row 4/i);
    await shot(page, "calibration-23-csv-row-errors");
    expect(Number((await db.execute({ sql: "SELECT count(*) AS n FROM spot_checks WHERE probe_id = ?", args: [probe.id] })).rows[0].n)).toBe(before);

    const good = `probe,taken_at,value,note\n${probe.serial},${now}Z,6.1,round 1\n${probe.serial},${now}Z,6.15,round 2\n`;
    await page.getByLabel("CSV file").setInputFiles({ name: "readings.csv", mimeType: "text/csv", buffer: Buffer.from(good) });
    await page.getByRole("button", { name: "Import the readings" }).click();
    await page.getByTestId("import-done").waitFor();
    expect(Number((await db.execute({ sql: "SELECT count(*) AS n FROM spot_checks WHERE probe_id = ?", args: [probe.id] })).rows[0].n)).toBe(before + 2);
    await shot(page, "calibration-24-csv-imported");

    await page.goto(`${baseURL}/probes/${probe.id}`);
    await page.getByTestId("spot-checks").waitFor();
    expect(await page.locator('[data-past-tolerance="true"]').count()).toBeGreaterThan(0);
    await shot(page, "calibration-25-probe-spot-checks");
    await context.close();
  });

  it("a grower corrects and deletes a spot check on the probe page, each audited; the night manager cannot", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "grower");
    await page.goto(`${baseURL}/probes/${probe.id}`);
    const first = page.locator("[data-spot-check]").first();
    const id = Number(await first.getAttribute("data-spot-check"));
    await first.getByRole("button", { name: /^Edit the spot check/ }).click();
    const dialog = page.getByRole("dialog", { name: "Correct the spot check" });
    await dialog.getByLabel(/Meter reading/).fill("16");
    await dialog.getByRole("button", { name: "Save the correction" }).click();
    await dialog.getByText("A pH reading must be between 0 and 14").waitFor();
    await shot(page, "calibration-26-spot-check-correct");
    await dialog.getByLabel(/Meter reading/).fill("6.12");
    await dialog.getByLabel("Note").fill("Corrected: misread the meter");
    await dialog.getByRole("button", { name: "Save the correction" }).click();
    await dialog.waitFor({ state: "hidden" });
    await page.locator(`[data-spot-check="${id}"]`).getByText("Corrected: misread the meter").waitFor();
    expect(Number((await db.execute({ sql: "SELECT meter_value FROM spot_checks WHERE id = ?", args: [id] })).rows[0].meter_value)).toBe(6.12);

    await page.locator(`[data-spot-check="${id}"]`).getByRole("button", { name: /^Delete the spot check/ }).click();
    await page.getByRole("dialog", { name: "Delete this spot check?" }).getByRole("button", { name: "Delete the spot check" }).click();
    await page.locator(`[data-spot-check="${id}"]`).waitFor({ state: "detached" });
    const audit = await db.execute({ sql: "SELECT action FROM audit_log WHERE entity = 'spot_check' AND entity_id = ? ORDER BY id", args: [id] });
    expect(audit.rows.map((r) => r.action).slice(-2)).toEqual(["spot-check.edit", "spot-check.delete"]);

    const night = await sessionFor(baseURL, "night_manager");
    const other = Number((await db.execute({ sql: "SELECT id FROM spot_checks WHERE probe_id = ? LIMIT 1", args: [probe.id] })).rows[0].id);
    expect((await night.fetch(`/api/spot-checks/${other}`, { method: "DELETE" })).status).toBe(403);
    const nightPage = await context.browser()!.newPage();
    await signInAs(nightPage, baseURL, "night_manager");
    await nightPage.goto(`${baseURL}/probes/${probe.id}`);
    await nightPage.getByTestId("spot-checks").waitFor();
    expect(await nightPage.getByRole("button", { name: /^Edit the spot check/ }).count()).toBe(0);
    await nightPage.close();
    await context.close();
  });
});
