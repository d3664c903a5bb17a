// Incidents end to end: simulator fault → broker → ingest → alert runner → incident → mail to
// the role on shift → the signed link in Chromium acknowledges it → the fault clears → resolved.
// Then the owner filters the history and exports it as CSV.
import { describe, expect, it } from "vitest";
import Papa from "papaparse";
import { onShift } from "@/ingest/alerts/shifts";
import { shot } from "./browser";
import { sessionFor } from "./session";
import { waitFor } from "./stack";
import { useIncidentHarness } from "./incidents-harness";

describe("incidents", () => {
  const harness = useIncidentHarness();
  const { baseURL } = harness;

  it("a fault opens an incident, the role on shift gets the mail, its link acknowledges, clearing resolves it", async () => {
    const { h, browser } = harness;
    const tank = await h.tank("G3 Pak choi");
    await h.quickRules(tank.id);
    const site = (await h.db.execute({ sql: "SELECT * FROM sites WHERE id = ?", args: [tank.siteId] })).rows[0];
    const role = onShift(
      { timeZone: String(site.time_zone), dayStartHour: Number(site.day_start_hour), nightStartHour: Number(site.night_start_hour), dayRole: site.day_role as never, nightRole: site.night_role as never },
      Date.now(),
    ).role;
    const recipient = (await h.db.execute({ sql: "SELECT id, email, name FROM users WHERE role = ? AND org_id = ? AND active = 1", args: [role, Number(site.org_id)] })).rows[0];

    await h.fault(tank.controllerId, "out-of-band", "temp");
    await waitFor("the incident", async () => (await h.incidents(tank.id, "out-of-band")).some((i) => i.state === "open"), 120_000, 500);
    const [incident] = (await h.incidents(tank.id, "out-of-band")).filter((i) => i.state === "open");
    await waitFor("the mail", async () => (await h.mails(String(recipient.email), "G3 Pak choi: Out of band")).length > 0, 60_000, 500);
    const [mail] = await h.mails(String(recipient.email), "G3 Pak choi: Out of band");
    expect(mail.text).toContain(`/incidents/${incident.id}`);
    const link = /(https?:\/\/\S+\/ack\/\S+)/.exec(mail.text)![1];
    expect(link.startsWith(baseURL)).toBe(true);

    // Opening the link (as a mail scanner would) changes nothing.
    const page = await browser.newPage();
    await page.goto(link);
    await page.getByRole("heading", { name: "Acknowledge this incident?" }).waitFor();
    expect((await h.incidents(tank.id, "out-of-band")).find((i) => i.id === incident.id)?.state).toBe("open");
    await shot(page, "ack-link-confirm");
    await page.getByRole("button", { name: "Acknowledge" }).click();
    await page.getByRole("heading", { name: "Acknowledged — thank you" }).waitFor();
    await shot(page, "ack-link-done");
    const acked = (await h.incidents(tank.id, "out-of-band")).find((i) => i.id === incident.id)!;
    expect(acked).toMatchObject({ state: "acknowledged", acknowledged_by: Number(recipient.id) });
    // The link works once.
    await page.goto(link);
    await page.getByRole("heading", { name: "This incident is already acknowledged" }).waitFor();
    await page.close();

    const notified = await h.db.execute({ sql: "SELECT detail FROM incident_events WHERE incident_id = ? AND kind = 'notified'", args: [incident.id] });
    // Other tests may have added people with the same role, so every one of them is mailed.
    expect(notified.rows.some((r) => String(r.detail).includes(String(recipient.name)))).toBe(true);

    await h.fault(tank.controllerId, "none", "temp");
    await waitFor("the incident to resolve", async () => (await h.incidents(tank.id, "out-of-band")).find((i) => i.id === incident.id)?.state === "resolved", 120_000, 500);
    const kinds = await h.db.execute({ sql: "SELECT kind FROM incident_events WHERE incident_id = ? ORDER BY id", args: [incident.id] });
    const sequence = kinds.rows.map((r) => String(r.kind));
    // One "notified" entry per person mailed, all before the acknowledgement.
    expect(sequence.filter((k, i) => k !== "notified" || sequence[i - 1] !== "notified")).toEqual(["opened", "notified", "acknowledged", "cleared", "resolved"]);
    const mailed = await h.db.execute({ sql: "SELECT count(*) AS n FROM notifications WHERE incident_id = ? AND kind = 'incident'", args: [incident.id] });
    expect(sequence.filter((k) => k === "notified").length).toBe(Number(mailed.rows[0].n));

    // The owner sees the timeline and the readings around it.
    const { context, page: owner } = await harness.signedIn("owner", { viewport: { width: 1440, height: 1100 } });
    await owner.goto(`${baseURL}/incidents/${incident.id}`);
    await owner.locator("[data-event=resolved]").waitFor();
    await owner.locator("[data-incident-chart] canvas").first().waitFor();
    await shot(owner, "incident-timeline");
    await context.close();
  }, 240_000);

  it("the owner filters the incident history and exports it as CSV", async () => {
    const { context, page } = await harness.signedIn("owner", { viewport: { width: 1440, height: 1100 }, acceptDownloads: true });
    await page.goto(`${baseURL}/incidents`);
    await page.locator("[data-table=incident-history] tbody tr").first().waitFor();
    // Counts per day as stacked bars by cause; the legend names each series with its total, no "—".
    await page.locator("[data-incident-trends=cause] canvas").first().waitFor();
    const legend = await page.locator("[data-trend-legend] li").allTextContents();
    expect(legend.length).toBeGreaterThan(0);
    expect(legend.every((l) => /\d+$/.test(l) && !l.includes("—"))).toBe(true);
    await shot(page, "incident-history");
    await page.getByRole("button", { name: "By tank" }).click();
    await page.locator("[data-incident-trends=tank] canvas").first().waitFor();
    const byTank = page.locator("[data-incident-trends=tank]");
    const canvasBox = (await byTank.locator("canvas").first().boundingBox())!;
    // Into the plot, then along it: uPlot places its cursor from the second mouse move over the plot on.
    await page.mouse.move(canvasBox.x + canvasBox.width - 20, canvasBox.y + canvasBox.height / 2);
    await page.mouse.move(canvasBox.x + canvasBox.width - 30, canvasBox.y + canvasBox.height / 2, { steps: 4 });
    await expect.poll(() => byTank.locator("[data-trend-readout]").textContent()).not.toMatch(/Point at a day/);
    await shot(page, "incident-history-by-tank");
    await page.getByRole("button", { name: "By cause" }).click();
    await page.locator("select[name=cause]").selectOption("stale");
    await page.getByRole("button", { name: "Apply" }).click();
    await page.waitForURL(/cause=stale/);
    const rows = page.locator("[data-table=incident-history] tbody tr[data-row]");
    await expect.poll(() => rows.count()).toBeGreaterThan(0);
    const causes = await page.locator("[data-table=incident-history] tbody tr[data-row] td:nth-child(4)").allTextContents();
    expect(new Set(causes)).toEqual(new Set(["Stale data"]));
    await shot(page, "incident-history-filtered");

    const download = page.waitForEvent("download");
    await page.getByRole("link", { name: "Export CSV" }).click();
    const file = await (await download).path();
    const { readFile } = await import("node:fs/promises");
    const parsed = Papa.parse<Record<string, string>>(await readFile(file, "utf8"), { header: true, skipEmptyLines: true });
    expect(parsed.meta.fields).toContain("minutes_to_acknowledge");
    expect(parsed.data.length).toBeGreaterThanOrEqual(causes.length);
    expect(new Set(parsed.data.map((r) => r.cause))).toEqual(new Set(["Stale data"]));
    await context.close();

    // The export is the owner's alone.
    const grower = await sessionFor(baseURL, "grower");
    expect((await grower.fetch("/api/incidents/export")).status).toBe(403);
  });

  it("the owner's demo mailbox lists the mail with its links clickable", async () => {
    const { context, page } = await harness.signedIn("owner", { viewport: { width: 1280, height: 1000 } });
    await page.goto(`${baseURL}/mailbox`);
    await page.locator("[data-mail]").first().waitFor();
    await page.locator("[data-mail] summary").first().click();
    await page.locator("[data-mail] a[href*='/ack/']").first().waitFor();
    await shot(page, "mailbox");
    await context.close();
  });
});
