// Renders app/icon.svg into the PNG icons the web app manifest lists (public/icons), with
// Debian's Chromium. Run after changing the icon: npx tsx scripts/icons.ts; commit the PNGs.
import fs from "node:fs";
import path from "node:path";
import { chromium } from "playwright-core";

const ROOT = path.resolve(import.meta.dirname, "..");
const svg = fs.readFileSync(path.join(ROOT, "app/icon.svg"), "utf8");
const out = path.join(ROOT, "public/icons");
fs.mkdirSync(out, { recursive: true });

const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium", args: ["--headless", "--no-sandbox", "--disable-gpu"] });
const page = await browser.newPage();
async function render(file: string, size: number, maskable: boolean) {
  await page.setViewportSize({ width: size, height: size });
  // A maskable icon keeps its mark inside the central 80 % safe zone, on a full-bleed background.
  const inner = maskable ? `<div style="width:100vw;height:100vh;background:#13524a;display:flex;align-items:center;justify-content:center"><div style="width:78%;height:78%">${svg}</div></div>` : svg;
  await page.setContent(`<html><body style="margin:0;background:transparent">${inner}<style>svg{width:100%;height:100%;display:block}</style></body></html>`);
  await page.screenshot({ path: path.join(out, file), omitBackground: true });
}
await render("icon-192.png", 192, false);
await render("icon-512.png", 512, false);
await render("maskable-512.png", 512, true);
await browser.close();
console.log(`icons written to ${out}`);
