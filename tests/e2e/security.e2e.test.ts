// The smaller holes an attacker found, closed: sign-out ends copied sessions, the sign-in lock is
// per address and account, changes come only from our own pages as JSON, pages carry a CSP and
// cannot be framed, and one organisation learns nothing of another through health, the demo
// mailbox or an invitation. A finished calibration run cannot move the simulated probe.
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Client } from "@libsql/client";
import type { Browser } from "playwright-core";
import { launch, signInAs } from "./browser";
import { OTHER_ORG_USER } from "./fixtures";
import { demoEmail, HttpSession, sessionFor } from "./session";
import { openStackDb } from "./database";

const RUN = Date.now().toString(36);

/** Signs in over HTTP as if from `address`; resolves with the session, or null when refused. */
async function signInFrom(baseURL: string, address: string, email: string, password: string): Promise<HttpSession | null> {
  const s = new HttpSession(baseURL);
  const csrf = await s.fetch("/api/auth/csrf", { headers: { "x-forwarded-for": address } });
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  await s.fetch("/api/auth/callback/credentials", {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", "x-forwarded-for": address },
    body: new URLSearchParams({ email, password, csrfToken }),
  });
  return s.cookieHeader().includes("session-token") ? s : null;
}

describe("security", () => {
  const baseURL = inject("baseURL");
  let db: Client;
  beforeAll(() => {
    db = openStackDb();
  });
  afterAll(() => db.close());

  it("signing out ends every copy of the session at once", async () => {
    const session = await sessionFor(baseURL, "night_manager");
    const copy = new HttpSession(baseURL);
    // The same cookies, as if copied off the machine.
    (copy as unknown as { cookies: Map<string, string> }).cookies = new Map((session as unknown as { cookies: Map<string, string> }).cookies);
    expect((await copy.fetch("/api/me")).status).toBe(200);
    const { csrfToken } = (await (await session.fetch("/api/auth/csrf")).json()) as { csrfToken: string };
    await session.fetch("/api/auth/signout", { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded" }, body: new URLSearchParams({ csrfToken }) });
    expect((await copy.fetch("/api/me")).status).toBe(401);
    // Signing in again works.
    expect((await (await sessionFor(baseURL, "night_manager")).fetch("/api/me")).status).toBe(200);
  });

  it("locks sign-in for the guessing address only, not for the account's owner elsewhere", async () => {
    const guesser = "203.0.113.9";
    for (let i = 0; i < 6; i++) expect(await signInFrom(baseURL, guesser, OTHER_ORG_USER.email, `wrong-${i}`)).toBeNull();
    // Locked from the guessing address, even with the right password…
    expect(await signInFrom(baseURL, guesser, OTHER_ORG_USER.email, OTHER_ORG_USER.password)).toBeNull();
    // …while the owner of the account signs in from their own.
    const owner = await signInFrom(baseURL, "198.51.100.7", OTHER_ORG_USER.email, OTHER_ORG_USER.password);
    expect(owner).not.toBeNull();
    expect((await owner!.fetch("/api/me")).status).toBe(200);
  });

  it("accepts changes only from our own pages, and only as JSON", async () => {
    const grower = await sessionFor(baseURL, "grower");
    const body = JSON.stringify({ tankId: 1, reason: "forged" });
    const foreign = await grower.fetch("/api/holds", { method: "POST", headers: { "content-type": "application/json", origin: "http://evil.example" }, body });
    expect(foreign.status).toBe(403);
    expect(((await foreign.json()) as { error: { code: string } }).error.code).toBe("cross_origin");
    const crossSite = await grower.fetch("/api/holds", { method: "POST", headers: { "content-type": "application/json", "sec-fetch-site": "cross-site" }, body });
    expect(crossSite.status).toBe(403);
    const plain = await grower.fetch("/api/holds", { method: "POST", headers: { "content-type": "text/plain", origin: baseURL }, body });
    expect(plain.status).toBe(415);
    expect(((await plain.json()) as { error: { message: string } }).error.message).toMatch(/application\/json/);
    // The same request from our own origin, as JSON, reaches validation.
    const own = await grower.fetch("/api/holds", { method: "POST", headers: { "content-type": "application/json", origin: baseURL }, body: "{}" });
    expect([400, 422]).toContain(own.status);
    const nothingHeld = await db.execute("SELECT count(*) AS n FROM holds WHERE reason = 'forged'");
    expect(Number(nothingHeld.rows[0].n)).toBe(0);
  });

  describe("in Chromium", () => {
    let browser: Browser;
    beforeAll(async () => {
      browser = await launch();
    });
    afterAll(async () => browser?.close());

    it("serves a Content-Security-Policy that forbids framing, and the pages run under it", async () => {
      const res = await fetch(`${baseURL}/sign-in`);
      const csp = res.headers.get("content-security-policy") ?? "";
      expect(csp).toContain("frame-ancestors 'none'");
      expect(csp).toContain("default-src 'self'");
      expect(csp).toContain("object-src 'none'");
      expect(res.headers.get("x-frame-options")).toBe("DENY");
      expect(res.headers.get("x-content-type-options")).toBe("nosniff");

      const page = await browser.newPage();
      const violations: string[] = [];
      page.on("console", (m) => {
        if (/Content Security Policy|Refused to/i.test(m.text())) violations.push(m.text());
      });
      await signInAs(page, baseURL, "grower");
      await page.getByText(/L1 Butterhead/).first().waitFor();
      await page.goto(`${baseURL}/calibrations`);
      await page.waitForLoadState("networkidle");
      await page.goto(`${baseURL}/settings`);
      await page.waitForLoadState("networkidle");
      expect(violations).toEqual([]);

      // Another site cannot frame Tidewell.
      const framer = await browser.newPage();
      const blocked = new Promise<boolean>((resolve) => {
        framer.on("console", (m) => /frame-ancestors|Refused to (display|frame)/i.test(m.text()) && resolve(true));
        setTimeout(() => resolve(false), 5000);
      });
      await framer.setContent(`<iframe src="${baseURL}/sign-in"></iframe>`);
      expect(await blocked).toBe(true);
      await page.close();
      await framer.close();
    });
  });

  it("shows another organisation neither the ingest's figures nor this farm's refused payloads", async () => {
    await db.execute({ sql: "INSERT INTO dead_letters (at, topic, reason, sample) VALUES (?, 'tw/v1/dev/ctl-north-l1/raw', ?, '{}')", args: [Date.now(), `test-${RUN}`] });
    const owner = await sessionFor(baseURL, "owner");
    const other = await new HttpSession(baseURL).signIn(OTHER_ORG_USER.email, OTHER_ORG_USER.password);
    type Health = { workers: Record<string, unknown>[]; deadLetters: { reason: string }[] };
    const mine = (await (await owner.fetch("/api/ingest/health")).json()) as Health;
    const theirs = (await (await other.fetch("/api/ingest/health")).json()) as Health;
    expect(mine.deadLetters.map((d) => d.reason)).toContain(`test-${RUN}`);
    expect(theirs.deadLetters.map((d) => d.reason)).not.toContain(`test-${RUN}`);
    for (const w of [...mine.workers, ...theirs.workers]) expect(w).not.toHaveProperty("stats");
    expect(theirs.workers.length).toBeGreaterThan(0);
  });

  it("an invitation to another organisation's address reveals nothing, and the demo mailbox is per organisation", async () => {
    const owner = await sessionFor(baseURL, "owner");
    const fresh = `someone.${RUN}@larkspur.example`;
    const invite = (email: string) =>
      owner.fetch("/api/settings/users", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ email, name: "Someone", role: "grower" }) });
    const a = await invite(fresh);
    const b = await invite(OTHER_ORG_USER.email);
    expect(b.status).toBe(a.status);
    const [ja, jb] = [(await a.json()) as Record<string, unknown>, (await b.json()) as Record<string, unknown>];
    expect(Object.keys(jb).sort()).toEqual(Object.keys(ja).sort());
    expect(jb).toMatchObject({ invitation: { email: OTHER_ORG_USER.email, status: "invited" }, mailed: true });
    const moved = await db.execute({ sql: "SELECT o.name FROM users u JOIN organisations o ON o.id = u.org_id WHERE u.email = ?", args: [OTHER_ORG_USER.email] });
    expect(moved.rows[0].name).toBe("Elsewhere Farm");
    const mail = (await (await fetch(`${inject("mailSinkURL")}/messages?to=${encodeURIComponent(OTHER_ORG_USER.email)}`)).json()) as { messages: { subject: string; text: string }[] };
    expect(mail.messages.some((m) => /tried to invite/.test(m.subject) && /nothing was changed/.test(m.text))).toBe(true);

    // Larkspur's owner sees the invitation to their new grower; the other farm's owner sees only theirs.
    const larkspurBox = await (await owner.fetch("/mailbox")).text();
    expect(larkspurBox).toContain(fresh);
    expect(larkspurBox).not.toContain(OTHER_ORG_USER.email);
    const other = await new HttpSession(baseURL).signIn(OTHER_ORG_USER.email, OTHER_ORG_USER.password);
    const otherBox = await (await other.fetch("/mailbox")).text();
    expect(otherBox).toContain("tried to invite");
    expect(otherBox).not.toContain("larkspur.example");
  });

  it("a finished calibration run cannot place the simulated probe in a buffer", async () => {
    const grower = await sessionFor(baseURL, "grower");
    const done = await db.execute({
      sql: "SELECT r.id FROM calibration_runs r JOIN tanks t ON t.id = r.tank_id JOIN sites s ON s.id = t.site_id JOIN users u ON u.org_id = s.org_id WHERE u.email = ? AND r.status = 'accepted' AND t.controller_id IS NOT NULL ORDER BY r.id LIMIT 1",
      args: [demoEmail("grower")],
    });
    const runId = Number(done.rows[0].id);
    const simulate = (placeIn: string) =>
      grower.fetch(`/api/calibrations/runs/${runId}/simulate`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ placeIn }) });
    const buffer = await simulate("standard");
    expect(buffer.status).toBe(409);
    expect(((await buffer.json()) as { error: { message: string } }).error.message).toMatch(/already accepted/);
    // Putting the probe back in the tank stays possible.
    expect((await simulate("tank")).status).toBe(200);
  });
});
