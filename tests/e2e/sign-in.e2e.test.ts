import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Role } from "@/db/schema";
import { launch, shot, signInAs } from "./browser";
import { sessionFor } from "./session";

const NAV: Record<Role, string[]> = {
  owner: ["Tank wall", "Tanks", "Calibrations", "Incidents", "Settings", "Demo mailbox"],
  grower: ["Tank wall", "Tanks", "Calibrations", "Incidents", "Settings"],
  night_manager: ["Tank wall", "Tanks", "Calibrations", "Incidents", "Settings"],
};

describe("sign-in and role navigation", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("sends a signed-out visitor to the sign-in page", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseURL}/tanks`);
    await expect.poll(() => new URL(page.url()).pathname).toBe("/sign-in");
    await shot(page, "sign-in");
    await page.close();
  });

  it("refuses a wrong password with a message the user can act on", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseURL}/sign-in`);
    await page.getByLabel("E-mail").fill("grower@larkspur.example");
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByText("do not match an account").waitFor();
    await page.close();
  });

  it("slows repeated failed sign-ins with a clear message", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseURL}/sign-in`);
    for (let i = 0; i < 5; i++) {
      await page.getByLabel("E-mail").fill("someone@larkspur.example");
      await page.getByLabel("Password").fill(`wrong-${i}`);
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.locator("p[role=alert]").waitFor();
      await page.getByRole("button", { name: "Sign in" }).waitFor();
      await expect.poll(() => page.getByRole("button", { name: "Sign in" }).isEnabled()).toBe(true);
    }
    await page.getByText("Too many failed sign-ins").waitFor();
    await page.close();
  });

  for (const role of ["owner", "grower", "night_manager"] as const) {
    it(`shows the ${role} their navigation and the seeded tanks`, async () => {
      const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
      const page = await context.newPage();
      await signInAs(page, baseURL, role);
      const nav = page.getByRole("navigation", { name: "Main" }).first();
      const labels = (await nav.getByRole("link").allTextContents()).map((s) => s.trim());
      expect(labels).toEqual(NAV[role]);
      await expect.poll(() => page.locator("[data-tank]").count()).toBe(8);
      await shot(page, `wall-${role}`);
      if (role === "night_manager") {
        await page.goto(`${baseURL}/settings`);
        await expect.poll(() => new URL(page.url()).pathname).toBe("/settings/preferences");
      }
      await context.close();
    });
  }

  it("refuses a forbidden action on the server", async () => {
    const night = await sessionFor(baseURL, "night_manager");
    const res = await night.fetch("/api/users");
    expect(res.status).toBe(403);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("forbidden");
    expect(body.error.message).toMatch(/Your role cannot/);
  });

  it("looks right on a phone", async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 2 });
    const page = await context.newPage();
    await signInAs(page, baseURL, "night_manager");
    await shot(page, "wall-phone");
    await context.close();
  });
});
