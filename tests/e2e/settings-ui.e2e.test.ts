// Setting up a farm from the browser: the owner invites a grower, who accepts through the link in
// the e-mail (real SMTP sink) and signs in; the owner adds a site, zone, tank and probes and
// registers a controller whose simulated device then streams into the new tank.
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Locator, Page } from "playwright-core";
import type { Client } from "@libsql/client";
import { Device } from "@/scripts/simulator/device";
import { launch, shot, signInAs } from "./browser";
import { waitFor } from "./stack";
import { removeSite } from "./settings-teardown";
import { openStackDb } from "./database";

const RUN = Date.now().toString(36);

interface SunkMail {
  to: string[];
  subject: string;
  text: string;
}

async function mailTo(sink: string, address: string): Promise<SunkMail> {
  let found: SunkMail | undefined;
  await waitFor(`mail to ${address}`, async () => {
    const res = await fetch(`${sink}/messages?to=${encodeURIComponent(address)}`);
    found = ((await res.json()) as { messages: SunkMail[] }).messages[0];
    return found !== undefined;
  });
  return found!;
}

/** The error message a field's control points at (aria-describedby), or null when it has none. */
async function fieldError(scope: Page | Locator, label: string): Promise<string | null> {
  const ids = (await scope.getByLabel(label, { exact: true }).first().getAttribute("aria-describedby")) ?? "";
  const id = ids.split(" ").find((x) => x.endsWith("-error"));
  return id ? scope.locator(`[id="${id}"]`).textContent() : null;
}

describe("settings in the browser", () => {
  const baseURL = inject("baseURL");
  const sink = inject("mailSinkURL");
  let browser: Browser;
  let db: Client;

  beforeAll(async () => {
    browser = await launch();
    db = openStackDb();
  });
  afterAll(async () => {
    await browser?.close();
    const site = await db.execute({ sql: "SELECT id FROM sites WHERE name = ?", args: [`West Bay ${RUN}`] });
    if (site.rows[0]) await removeSite(db, Number(site.rows[0].id));
    db?.close();
  });

  it("invites a grower by e-mail, who sets a password from the link and signs in", async () => {
    const email = `ines.${RUN}@farm.example`;
    const ownerContext = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const owner = await ownerContext.newPage();
    await signInAs(owner, baseURL, "owner");
    await owner.goto(`${baseURL}/settings`);
    await shot(owner, "settings-index-owner");
    await owner.getByRole("link", { name: /Organisation & users/ }).first().click();
    await owner.waitForURL(`${baseURL}/settings/users`);

    const invite = owner.getByRole("form", { name: "Invite someone" });
    await invite.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => fieldError(invite, "E-mail")).toBe("Enter a valid e-mail address.");
    await expect.poll(() => fieldError(invite, "Name")).toBe("Enter a name.");
    // An address that already has an account: the server's refusal lands under the e-mail field.
    await invite.getByLabel("Name").fill("Inés Duarte");
    await invite.getByLabel("E-mail").fill("grower@larkspur.example");
    await invite.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => fieldError(invite, "E-mail")).toBe("Someone with this e-mail address already has an account.");
    await shot(owner, "settings-users-invite-errors");
    await invite.getByLabel("E-mail").fill(email);
    await invite.getByLabel("Role").selectOption("grower");
    await invite.getByRole("button", { name: "Send invitation" }).click();
    await owner.getByText(`Invitation sent to ${email}.`).waitFor();
    await owner.locator("[data-table=users] tr", { hasText: email }).getByText("Invited").waitFor();
    await shot(owner, "settings-users");

    const mail = await mailTo(sink, email);
    expect(mail.subject).toContain("invited you to Larkspur Valley Growers");
    const link = /(http\S+\/invite\/\S+)/.exec(mail.text)?.[1];
    expect(link).toBeDefined();

    const inviteeContext = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 2 });
    const invitee = await inviteeContext.newPage();
    await invitee.goto(link!);
    await invitee.getByRole("heading", { name: "Welcome, Inés Duarte" }).waitFor();
    await invitee.getByLabel("New password").fill("short");
    await invitee.getByLabel("Repeat password").fill("shorter");
    await invitee.getByRole("button", { name: "Set password" }).click();
    await expect.poll(() => fieldError(invitee, "New password")).toBe("Use at least 10 characters.");
    await expect.poll(() => fieldError(invitee, "Repeat password")).toBe("The two passwords differ.");
    await shot(invitee, "invite-accept-errors");
    const password = "tide-pool-seventeen";
    await invitee.getByLabel("New password").fill(password);
    await invitee.getByLabel("Repeat password").fill(password);
    await invitee.getByRole("button", { name: "Set password" }).click();
    await invitee.waitForURL(/\/sign-in/);
    await invitee.getByLabel("E-mail").fill(email);
    await invitee.getByLabel("Password").fill(password);
    await invitee.getByRole("button", { name: "Sign in" }).click();
    await invitee.waitForURL(`${baseURL}/`);
    await invitee.locator("header").getByText("Grower", { exact: true }).waitFor();

    // The link works once.
    const again = await browser.newPage();
    await again.goto(link!);
    await again.getByText("This invitation has already been used").waitFor();
    await again.close();

    // Deactivation takes effect on the invitee's very next request.
    await owner.reload();
    const row = owner.locator("[data-table=users] tr", { hasText: email });
    await row.getByText("Active").waitFor();
    await row.getByRole("button", { name: "Deactivate" }).click();
    const dialog = owner.getByRole("dialog", { name: "Deactivate Inés Duarte?" });
    await dialog.waitFor();
    await shot(owner, "settings-users-deactivate-confirm");
    await dialog.getByRole("button", { name: "Deactivate" }).click();
    await owner.getByText("Inés Duarte is deactivated.").waitFor();
    // The status filter matches whole values: "Active" leaves out the deactivated.
    await owner.getByLabel("Filter by Status").selectOption("Active");
    await expect.poll(() => owner.locator("[data-table=users] tbody tr[data-row]", { hasText: email }).count()).toBe(0);
    expect(await owner.locator("[data-table=users] tbody tr[data-row]").count()).toBeGreaterThanOrEqual(3);
    await invitee.goto(`${baseURL}/tanks`);
    await expect.poll(() => new URL(invitee.url()).pathname).toBe("/sign-in");
    await inviteeContext.close();
    await ownerContext.close();
  });

  it("sets up a site, a tank and its probes, and registers a controller that streams into it", async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "owner");
    const siteName = `West Bay ${RUN}`;
    const tankName = `W1 Basil ${RUN}`;
    const controllerId = `ctl-west-${RUN}`;

    // Site: a bad time zone is refused under its field, then fixed.
    await page.goto(`${baseURL}/settings/sites`);
    await page.getByRole("button", { name: "Add site" }).click();
    const siteForm = page.getByRole("form", { name: "New site" });
    await siteForm.getByLabel("Site name").fill(siteName);
    await siteForm.getByLabel("Time zone").fill("Atlantis/Deep");
    await siteForm.getByLabel("Maximum calibration interval (days)").fill("45");
    await siteForm.getByRole("button", { name: "Add site" }).click();
    await expect.poll(() => fieldError(siteForm, "Time zone")).toMatch(/Choose a time zone from the list/);
    await shot(page, "settings-site-form-errors");
    await siteForm.getByLabel("Time zone").fill("Europe/Lisbon");
    await siteForm.getByLabel("Night shift starts").selectOption("20");
    await siteForm.getByRole("button", { name: "Add site" }).click();
    await page.getByText(`${siteName} added.`).waitFor();
    const siteCard = page.locator(`[data-site="${siteName}"]`);
    await siteCard.getByPlaceholder("New zone (house, room, bay)").fill("Bay 1");
    await siteCard.getByRole("button", { name: "Add zone" }).click();
    await siteCard.getByText("Bay 1").waitFor();
    await shot(page, "settings-sites");

    // Tank: a preset fills the band; an interval above the site's maximum is refused by the server.
    await page.goto(`${baseURL}/settings/tanks`);
    await page.getByRole("button", { name: "Add tank" }).click();
    const tankForm = page.getByRole("form", { name: "New tank" });
    await tankForm.getByLabel("Tank name").fill(tankName);
    await tankForm.getByLabel("Site", { exact: true }).selectOption({ label: siteName });
    await expect.poll(() => tankForm.getByLabel("Zone").inputValue()).not.toBe("");
    await tankForm.getByLabel("Crop").fill("basil and herbs");
    // DOMAIN.md section 4: basil and herbs, pH 5.5–6.5, EC 1.0–1.6 mS/cm (common practice)
    await expect.poll(() => tankForm.getByLabel("EC maximum (mS/cm)").inputValue()).toBe("1.6");
    await tankForm.getByLabel("pH maximum").fill("6.3");
    await tankForm.getByLabel("Calibration interval (days)").fill("60");
    await tankForm.getByRole("button", { name: "Add tank" }).click();
    await expect.poll(() => fieldError(tankForm, "Calibration interval (days)")).toMatch(/allows at most 45 days between calibrations/);
    await tankForm.getByLabel("Calibration interval (days)").fill("30");
    await tankForm.getByRole("button", { name: "Add tank" }).click();
    await page.getByText(`${tankName} added.`).waitFor();
    await page.locator("[data-table=tanks] tr", { hasText: tankName }).getByText("5.50–6.30").waitFor();
    await shot(page, "settings-tanks");

    // Probes: pH, EC (with its nominal cell constant) and temperature.
    await page.goto(`${baseURL}/settings/probes`);
    for (const [kind, serial] of [["pH", `PH-W-${RUN}`], ["EC", `EC-W-${RUN}`], ["Temperature", `TS-W-${RUN}`]] as const) {
      await page.getByRole("button", { name: "Add probe" }).click();
      const form = page.getByRole("form", { name: "New probe" });
      await form.getByLabel("Tank").selectOption({ label: `${tankName} · ${siteName}` });
      await form.getByLabel("Measures").selectOption({ label: kind });
      await form.getByLabel("Serial number").fill(serial);
      if (kind === "EC") {
        await form.getByLabel("Nominal cell constant (/cm)").fill("");
        await form.getByRole("button", { name: "Add probe" }).click();
        await expect.poll(() => fieldError(form, "Nominal cell constant (/cm)")).toMatch(/needs its nominal cell constant/);
        await form.getByLabel("Nominal cell constant (/cm)").fill("1.0");
      }
      await form.getByRole("button", { name: "Add probe" }).click();
      await page.getByText(`Probe ${serial} added.`).waitFor();
    }
    await shot(page, "settings-probes");

    // Controller: registered for the tank; the secret is shown once.
    await page.goto(`${baseURL}/settings/devices`);
    await page.getByRole("button", { name: "Register controller" }).click();
    const reg = page.getByRole("form", { name: "Register a controller" });
    await reg.getByLabel("Tank").selectOption({ label: `${tankName} · ${siteName}` });
    await reg.getByLabel("Controller id").fill("Not valid!");
    await reg.getByRole("button", { name: "Register and issue credentials" }).click();
    await expect.poll(() => fieldError(reg, "Controller id")).toMatch(/lower-case letters/);
    await reg.getByLabel("Controller id").fill(controllerId);
    await reg.getByRole("button", { name: "Register and issue credentials" }).click();
    const shown = page.getByRole("dialog", { name: `Credentials for ${controllerId}` });
    await shown.waitFor();
    const username = (await shown.locator('[data-credential="Username"]').textContent())!;
    const secret = (await shown.locator('[data-credential="Secret"]').textContent())!;
    expect(secret.length).toBeGreaterThanOrEqual(32);
    await shot(page, "settings-devices-credentials");
    await shown.getByRole("button", { name: "I have copied the secret" }).click();
    await page.locator("[data-table=devices] tr", { hasText: controllerId }).getByText("Active").waitFor();
    await shot(page, "settings-devices");

    // The simulator's own device client, given the credentials the owner copied.
    const [{ id: tankId }] = (await db.execute({ sql: "SELECT id FROM tanks WHERE name = ?", args: [tankName] })).rows as unknown as { id: number }[];
    const counters = { messages: 0, samples: 0, failed: 0, pending: 0 };
    const device = new Device({ controllerId, username, password: secret, tankId: Number(tankId) }, inject("mqttUrl"), counters, () => undefined);
    device.connect();
    try {
      await waitFor(
        "readings from the new controller",
        async () => {
          const ts = Date.now();
          device.publish([
            { serial: `PH-W-${RUN}`, ts, signal: 30 },
            { serial: `EC-W-${RUN}`, ts, signal: 1300 },
            { serial: `TS-W-${RUN}`, ts, signal: 20.2 },
          ]);
          const r = await db.execute({ sql: "SELECT count(DISTINCT r.probe_id) AS n FROM readings r JOIN probes p ON p.id = r.probe_id WHERE p.tank_id = ?", args: [Number(tankId)] });
          return Number(r.rows[0].n) === 3;
        },
        30_000,
        1000,
      );
    } finally {
      await device.close();
    }
    await page.goto(`${baseURL}/`);
    await page.locator("[data-tank]", { hasText: tankName }).first().waitFor();
    await shot(page, "settings-new-tank-on-wall");

    // With the owner's EC unit set to ppm (500 scale), the band is typed in ppm and stored in µS/cm.
    await page.goto(`${baseURL}/settings/preferences`);
    await page.getByLabel("Show EC in").selectOption("ppm-500");
    await page.getByRole("button", { name: "Save preferences" }).click();
    await page.getByText("Preferences saved.").first().waitFor();
    try {
      await page.goto(`${baseURL}/settings/tanks`);
      await page.getByRole("button", { name: `Edit ${tankName}` }).click();
      const edit = page.getByRole("form", { name: `Edit ${tankName}` });
      // DOMAIN.md section 3: ppm-500 = EC (mS/cm) × 500 (common practice), so 1.6 mS/cm shows as 800
      await expect.poll(() => edit.getByLabel("EC maximum (ppm 500)").inputValue()).toBe("800");
      await edit.getByLabel("EC maximum (ppm 500)").fill("850");
      await shot(page, "settings-tank-edit-ppm");
      await edit.getByRole("button", { name: "Save tank" }).click();
      await page.getByText(`${tankName} saved.`).waitFor();
      const saved = await db.execute({ sql: "SELECT ec_max_us FROM tanks WHERE id = ?", args: [Number(tankId)] });
      expect(Number(saved.rows[0].ec_max_us)).toBeCloseTo(1700, 6);
    } finally {
      await page.goto(`${baseURL}/settings/preferences`);
      await page.getByLabel("Show EC in").selectOption("mS/cm");
      await page.getByRole("button", { name: "Save preferences" }).click();
      await page.getByText("Preferences saved.").first().waitFor();
    }
    await context.close();
  });

  it("shows the night manager their preferences only", async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 2 });
    const page = await context.newPage();
    await signInAs(page, baseURL, "night_manager");
    await page.goto(`${baseURL}/settings`);
    await page.waitForURL(`${baseURL}/settings/preferences`);
    await page.getByRole("form", { name: "Preferences" }).waitFor();
    expect(await page.getByRole("navigation", { name: "Settings" }).count()).toBe(0);
    await shot(page, "settings-preferences-phone");
    await page.goto(`${baseURL}/settings/devices`);
    await page.waitForURL(`${baseURL}/settings/preferences`);
    await context.close();
  });

  it("filters the audit log in the owner's table", async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    await signInAs(page, baseURL, "owner");
    await page.goto(`${baseURL}/settings/audit`);
    await page.getByLabel("Filter by Change").selectOption("device.register");
    await expect
      .poll(async () => {
        const rows = await page.locator("[data-table=audit] tbody tr[data-row]").allTextContents();
        return rows.length > 0 && rows.every((t) => t.includes("device.register"));
      })
      .toBe(true);
    await page.getByLabel("Search the audit log").fill(`ctl-west-${RUN}`);
    await expect.poll(() => page.locator("[data-table=audit] tbody tr[data-row]").count()).toBe(1);
    await shot(page, "settings-audit");
    await page.goto(`${baseURL}/settings/exports`);
    await shot(page, "settings-exports");
    await context.close();
  });
});
