// Calibration records entered by hand in Chromium: a calibration done elsewhere with its
// certificate (type checked by content, not name), a spot check past tolerance, and a CSV of
// spot checks that imports nothing until every row is right.
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import { createClient, type Client } from "@libsql/client";
import { launch, shot, signInAs } from "./browser";
import { HttpSession, sessionFor } from "./session";
import { OTHER_ORG_USER } from "./fixtures";

const PNG = Buffer.from("89504e470d0a1a0a0000000d4948445200000001000000010806000000", "hex");

describe("calibration records entered by hand", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let db: Client;
  let probe: { id: number; serial: string };

  beforeAll(async () => {
    browser = await launch();
    db = createClient({ url: inject("databaseUrl") });
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
});
