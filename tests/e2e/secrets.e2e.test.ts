// No secret lives in the source: a session forged with the former built-in key is worthless, and
// the web server will not start without its own.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { spawn } from "node:child_process";
import { describe, expect, inject, it } from "vitest";
import { encode } from "next-auth/jwt";
import { ROOT, freePort } from "./stack";
import { openStackDb } from "./database";

const FORMER_BUILT_IN_SECRET = "tidewell-demo-secret-change-me-in-production-000";

async function ownerToken(secret: string) {
  const db = openStackDb();
  const owner = await db.execute("SELECT id, org_id, email, session_version FROM users WHERE role = 'owner' ORDER BY id LIMIT 1");
  db.close();
  const row = owner.rows[0];
  const salt = "authjs.session-token";
  const value = await encode({ salt, secret, token: { sub: String(row.id), uid: String(row.id), role: "owner", orgId: Number(row.org_id), email: String(row.email), sv: Number(row.session_version) } });
  return `${salt}=${value}`;
}

describe("secrets", () => {
  const baseURL = inject("baseURL");

  it("refuses a session cookie signed with the former built-in secret", async () => {
    const forged = await fetch(`${baseURL}/api/me`, { headers: { cookie: await ownerToken(FORMER_BUILT_IN_SECRET) } });
    expect(forged.status).toBe(401);
    // The same cookie signed with this installation's secret is accepted: the forgery was well formed.
    const genuine = await fetch(`${baseURL}/api/me`, { headers: { cookie: await ownerToken(inject("secrets").AUTH_SECRET) } });
    expect(genuine.status).toBe(200);
  });

  it("the web server refuses to start without AUTH_SECRET, saying what to set", async () => {
    const port = await freePort();
    const env: NodeJS.ProcessEnv = { ...process.env, AUTH_SECRET: "", NEXT_TELEMETRY_DISABLED: "1" };
    const logFile = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "tidewell-nosecret-")), "web.log");
    const out = fs.openSync(logFile, "a");
    const child = spawn(path.join(ROOT, "node_modules/.bin/tsx"), ["server/main.ts", "-H", "127.0.0.1", "-p", String(port)], { cwd: ROOT, env, stdio: ["ignore", out, out] });
    const code = await new Promise<number | null>((resolve) => {
      const timer = setTimeout(() => {
        child.kill("SIGKILL");
        resolve(null);
      }, 60_000);
      child.on("exit", (c) => {
        clearTimeout(timer);
        resolve(c);
      });
    });
    const log = fs.readFileSync(logFile, "utf8");
    expect(code, log).toBe(1);
    expect(log).toMatch(/refusing to start[\s\S]*AUTH_SECRET is not set/);
    fs.rmSync(path.dirname(logFile), { recursive: true, force: true });
  });
});
