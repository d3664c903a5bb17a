import fs from "node:fs";
import path from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";
import { DEMO_PASSWORD } from "@/db/seed/scenario";
import type { Role } from "@/db/schema";
import { demoEmail } from "./session";
import { ROOT } from "./stack";

export const SCREENSHOTS = path.join(ROOT, "test-results", "screenshots");

export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-quic", "--no-first-run", "--disable-component-update", "--disable-sync"],
  });
}

export async function signInAs(page: Page, baseURL: string, role: Role) {
  await page.goto(`${baseURL}/sign-in`);
  await page.getByLabel("E-mail").fill(demoEmail(role));
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${baseURL}/`);
}

export async function shot(page: Page, name: string) {
  fs.mkdirSync(SCREENSHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`), fullPage: true });
}
