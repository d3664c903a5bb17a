// What the incident and hold end-to-end tests share: quick rule overrides for one tank, the
// mail sink, simulator faults, Chromium and signed-in pages. The alert runner itself runs inside
// the stack's ingest (ingest/hooks.ts → ingest/alerts/wire.ts, ticking every second per
// global-setup.ts). useIncidentHarness() is the one set-up and teardown: a test file calls it
// once, and everything it opened (faults, browser contexts, clients) is undone after the file.
import { afterAll, beforeAll, inject } from "vitest";
import mqtt, { type MqttClient } from "mqtt";
import type { Client } from "@libsql/client";
import type { Browser, BrowserContext, BrowserContextOptions, Page } from "playwright-core";
import { SERVICE_ACCOUNTS, topics } from "@/ingest/topics";
import type { SimFault } from "@/ingest/payloads";
import type { Role } from "@/db/schema";
import { launch, signInAs } from "./browser";
import { openStackDb } from "./database";

export interface Harness {
  db: Client;
  mqtt: MqttClient;
  tank(name: string): Promise<{ id: number; controllerId: string; siteId: number }>;
  /** Faster rules (and a wider temperature band) for one tank, so a test waits seconds, not minutes. */
  quickRules(tankId: number): Promise<void>;
  fault(controllerId: string, fault: SimFault, measure?: "ph" | "ec" | "temp"): Promise<void>;
  mails(to: string, subjectPart: string): Promise<{ subject: string; text: string; to: string[] }[]>;
  incidents(tankId: number, cause: string): Promise<{ id: number; state: string; cleared_at: number | null; opened_at: number; acknowledged_by: number | null }[]>;
  /** Ends every fault this harness set, then closes its clients. */
  stop(): Promise<void>;
}

const QUICK = { fireDelayMs: 3000, clearDelayMs: 3000 };
/** Settling after a hold on a quick-rules tank: longer than the clear delay, so a test can tell them apart. */
export const QUICK_SETTLE_MS = 8000;

async function startHarness(): Promise<Harness> {
  // The ingest writes every second: wait for its locks rather than fail.
  const db = openStackDb();
  const client = await mqtt.connectAsync(inject("mqttUrl"), {
    clientId: `tidewell-web-e2e-${process.pid}-${Math.random().toString(36).slice(2, 6)}`,
    username: SERVICE_ACCOUNTS.web.username,
    password: SERVICE_ACCOUNTS.web.password(),
  });
  const faulted = new Set<string>();
  const sendFault = async (controllerId: string, fault: SimFault, measure?: "ph" | "ec" | "temp") => {
    faulted.add(controllerId);
    await client.publishAsync(topics.simControl(controllerId), JSON.stringify({ v: 1, fault, ...(measure ? { measure } : {}) }), { qos: 1 });
  };
  return {
    db,
    mqtt: client,
    async tank(name) {
      const r = await db.execute({ sql: "SELECT id, controller_id, site_id FROM tanks WHERE name = ?", args: [name] });
      return { id: Number(r.rows[0].id), controllerId: String(r.rows[0].controller_id), siteId: Number(r.rows[0].site_id) };
    },
    async quickRules(tankId) {
      const org = await db.execute({ sql: "SELECT s.org_id FROM tanks t JOIN sites s ON s.id = t.site_id WHERE t.id = ?", args: [tankId] });
      const orgId = Number(org.rows[0].org_id);
      const rows: [string, boolean, Record<string, number>][] = [
        ["out-of-band", true, QUICK],
        ["rate-of-change", false, {}], // the simulator's faults step rather than drift
        ["hold-overrun", true, { "settling.afterReleaseMs": QUICK_SETTLE_MS }],
      ];
      // The tests fault the solution temperature (the simulator's one fault that ends at once); a
      // wider band keeps a cool night's 18 °C solution clear of the hysteresis margin when it ends.
      await db.execute({ sql: "UPDATE tanks SET temp_min = 16, temp_max = 24 WHERE id = ?", args: [tankId] });
      for (const [cause, enabled, settings] of rows) {
        await db.execute({ sql: "INSERT INTO alert_rules (org_id, tank_id, cause, enabled, settings) VALUES (?, ?, ?, ?, ?)", args: [orgId, tankId, cause, enabled ? 1 : 0, JSON.stringify(settings)] });
      }
    },
    fault: sendFault,
    async mails(to, subjectPart) {
      const res = await fetch(`${inject("mailSinkURL")}/messages?to=${encodeURIComponent(to)}`);
      const { messages } = (await res.json()) as { messages: { subject: string; text: string; to: string[] }[] };
      return messages.filter((m) => m.subject.includes(subjectPart));
    },
    async incidents(tankId, cause) {
      const r = await db.execute({ sql: "SELECT id, state, cleared_at, opened_at, acknowledged_by FROM incidents WHERE tank_id = ? AND cause = ? ORDER BY id", args: [tankId, cause] });
      return r.rows.map((x) => ({ id: Number(x.id), state: String(x.state), cleared_at: x.cleared_at === null ? null : Number(x.cleared_at), opened_at: Number(x.opened_at), acknowledged_by: x.acknowledged_by === null ? null : Number(x.acknowledged_by) }));
    },
    async stop() {
      for (const controllerId of faulted) await sendFault(controllerId, "none");
      await client.endAsync();
      db.close();
    },
  };
}

export interface UsedHarness {
  /** The harness (database, broker, mail sink, faults); valid inside tests. */
  readonly h: Harness;
  readonly browser: Browser;
  readonly baseURL: string;
  /** A new browser context signed in as a demo user of `role`; closed with the harness. */
  signedIn(role: Role, options?: BrowserContextOptions): Promise<{ context: BrowserContext; page: Page }>;
}

/** Starts the harness and Chromium before the file's tests; stops both (and ends faults) after. */
export function useIncidentHarness(): UsedHarness {
  const baseURL = inject("baseURL");
  let h: Harness | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    h = await startHarness();
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
    await h?.stop();
  });
  const started = <T>(x: T | undefined): T => {
    if (x === undefined) throw new Error("useIncidentHarness: use it inside a test");
    return x;
  };
  return {
    baseURL,
    get h() {
      return started(h);
    },
    get browser() {
      return started(browser);
    },
    async signedIn(role, options = {}) {
      const context = await started(browser).newContext({ viewport: { width: 1440, height: 1000 }, ...options });
      const page = await context.newPage();
      await signInAs(page, baseURL, role);
      return { context, page };
    },
  };
}
