// Installation secrets: nothing in the source stands in for them; the demo generates its own.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { generateSecrets, MissingSecret, missingSecrets, requireSecret, SECRET_NAMES } from "@/ingest/secrets";
import { SERVICE_ACCOUNTS } from "@/ingest/topics";
import { loadOrCreateDemoSecrets } from "@/scripts/demo-secrets";

const saved = { ...process.env };
afterEach(() => {
  for (const n of SECRET_NAMES) process.env[n] = saved[n];
});

describe("installation secrets", () => {
  it("refuses an unset or short secret with what to do, instead of a built-in value", () => {
    delete process.env.AUTH_SECRET;
    expect(() => requireSecret("AUTH_SECRET")).toThrow(MissingSecret);
    expect(() => requireSecret("AUTH_SECRET")).toThrow(/AUTH_SECRET is not set[\s\S]*openssl rand[\s\S]*npm run demo/);
    process.env.AUTH_SECRET = "short";
    expect(() => requireSecret("AUTH_SECRET")).toThrow(/shorter than 32 characters/);
    delete process.env.MQTT_WEB_PASSWORD;
    expect(() => SERVICE_ACCOUNTS.web.password()).toThrow(/MQTT_WEB_PASSWORD is not set/);
    expect(missingSecrets(["AUTH_SECRET", "MQTT_WEB_PASSWORD", "MQTT_INGEST_PASSWORD"])).toEqual(["AUTH_SECRET", "MQTT_WEB_PASSWORD"]);
  });

  it("generates long, distinct random values", () => {
    const a = generateSecrets();
    const b = generateSecrets();
    for (const n of SECRET_NAMES) {
      expect(a[n].length).toBeGreaterThanOrEqual(43);
      expect(a[n]).not.toBe(b[n]);
    }
    expect(new Set(Object.values(a)).size).toBe(SECRET_NAMES.length);
  });
});

describe("the demo's secrets file", () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tidewell-secrets-"));
  afterEach(() => fs.rmSync(path.join(dir, "data"), { recursive: true, force: true }));

  it("is generated on first start with mode 0600, then reused", () => {
    const file = path.join(dir, "data", "secrets.json");
    const first = loadOrCreateDemoSecrets(file);
    expect(first.created).toBe(true);
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);
    const again = loadOrCreateDemoSecrets(file);
    expect(again.created).toBe(false);
    expect(again.secrets).toEqual(first.secrets);
    // Widened by hand: tightened again on the next start.
    fs.chmodSync(file, 0o644);
    loadOrCreateDemoSecrets(file);
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);
  });

  it("refuses a damaged file and says how to recover", () => {
    const file = path.join(dir, "data", "secrets.json");
    fs.mkdirSync(path.dirname(file), { recursive: true });
    fs.writeFileSync(file, JSON.stringify({ AUTH_SECRET: "x" }));
    expect(() => loadOrCreateDemoSecrets(file)).toThrow(/not a valid secrets file.*delete it/);
  });

  it("is git-ignored", () => {
    const ignore = fs.readFileSync(path.join(import.meta.dirname, "../../.gitignore"), "utf8").split("\n");
    expect(ignore).toContain("data/");
  });
});
