// The live stream as the custom server answers it (server/stream/handler.ts), on a real http
// server, the embedded broker and a seeded database: the session cookie is checked as Auth.js and
// the guard check it, streams of one scope share one listener on the live hub, and a reader that
// stops reading is dropped once 4 MB wait for it while the others keep streaming.
import http from "node:http";
import net from "node:net";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { encode } from "next-auth/jwt";
import type { MqttClient } from "mqtt";
import { organisations, sites, tanks, users } from "@/db/schema";
import { endSessions } from "@/app/_server/session-version";
import { handleStream } from "@/server/stream/handler";
import { streamStats } from "@/server/stream/fan-out";
import { topics } from "@/ingest/topics";
import { connectMqtt, endMqtt, serviceLogin } from "./helpers/mqtt";
import { startBroker } from "./helpers/tidewell";
import { useTestDatabase } from "./helpers/use-test-database";
import { sleep, waitFor } from "./helpers/wait";

const testDb = useTestDatabase({ label: "stream", per: "file" });

const SSE = { accept: "text/event-stream" };
const until = (message: string, condition: () => boolean, timeoutMs: number) => waitFor(condition, Boolean, { timeoutMs, intervalMs: 50, message });

describe("the live stream's own handler", () => {
  let server: http.Server;
  let base: string;
  let publisher: MqttClient;
  let owner: { id: number; orgId: number; cookie: string };
  let tankId: number;
  let otherOrgTank: number;

  async function cookieFor(user: typeof users.$inferSelect): Promise<string> {
    const salt = "authjs.session-token";
    const token = await encode({ salt, secret: process.env.AUTH_SECRET!, token: { sub: String(user.id), uid: String(user.id), role: user.role, orgId: user.orgId, email: user.email, sv: user.sessionVersion } });
    return `${salt}=${token}`;
  }

  beforeAll(async () => {
    const { db, orm } = testDb;
    process.env.DATABASE_URL = db.url;
    const broker = await startBroker(db);
    process.env.MQTT_URL = broker.url;
    publisher = await connectMqtt(broker.url, serviceLogin("ingest", "stream-handler"));
    server = http.createServer((req, res) => void handleStream(req, res));
    await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
    base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

    const row = (await orm.query.users.findFirst({ where: eq(users.role, "owner") }))!;
    owner = { id: row.id, orgId: row.orgId, cookie: await cookieFor(row) };
    const tank = (await orm.select({ id: tanks.id }).from(tanks).innerJoin(sites, eq(sites.id, tanks.siteId)).where(eq(sites.orgId, row.orgId)).limit(1))[0];
    tankId = tank.id;
    const [org] = await orm.insert(organisations).values({ name: "Elsewhere Farm" }).returning();
    const [site] = await orm.insert(sites).values({ orgId: org.id, name: "Elsewhere Site" }).returning();
    const [other] = await orm.insert(tanks).values({ siteId: site.id, name: "Elsewhere Tank", crop: "leafy greens", phMin: 5.5, phMax: 6.5, ecMinUs: 800, ecMaxUs: 1200 }).returning();
    otherOrgTank = other.id;
  });

  afterAll(async () => {
    server?.closeAllConnections();
    server?.close();
    if (publisher) await endMqtt(publisher);
  });

  it("answers 401 without a session, in the guard's error shape", async () => {
    const res = await fetch(`${base}/api/stream`, { headers: SSE });
    expect(res.status).toBe(401);
    expect(res.headers.get("content-type")).toContain("application/json");
    expect(await res.json()).toEqual({ error: { code: "unauthorized", message: "Sign in to continue." } });
    const forged = await fetch(`${base}/api/stream`, { headers: { ...SSE, cookie: "authjs.session-token=not-a-token" } });
    expect(forged.status).toBe(401);
  });

  it("answers 400 to a bad query, 406 without Accept: text/event-stream, 404 for another farm's tank", async () => {
    const bad = await fetch(`${base}/api/stream?tank=abc`, { headers: { ...SSE, cookie: owner.cookie } });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { code: string } }).error.code).toBe("invalid_input");
    const plain = await fetch(`${base}/api/stream`, { headers: { cookie: owner.cookie } });
    expect(plain.status).toBe(406);
    expect(((await plain.json()) as { error: { code: string } }).error.code).toBe("not_acceptable");
    const elsewhere = await fetch(`${base}/api/stream?tank=${otherOrgTank}`, { headers: { ...SSE, cookie: owner.cookie } });
    expect(elsewhere.status).toBe(404);
    expect(await elsewhere.json()).toEqual({ error: { code: "not_found", message: "That site or tank was not found." } });
  });

  it("streams to a valid session, and refuses the same cookie once its user signed out", async () => {
    const { orm } = testDb;
    const night = (await orm.query.users.findFirst({ where: eq(users.role, "night_manager") }))!;
    const cookie = await cookieFor(night);
    const abort = new AbortController();
    const res = await fetch(`${base}/api/stream`, { headers: { ...SSE, cookie }, signal: abort.signal });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/event-stream");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    const reader = res.body!.getReader();
    const first = new TextDecoder().decode((await reader.read()).value);
    expect(first).toContain("retry: 2000");
    abort.abort();

    await endSessions(night.id); // what signing out does
    const after = await fetch(`${base}/api/stream`, { headers: { ...SSE, cookie } });
    expect(after.status).toBe(401);
  });

  it("gives streams of one scope one hub listener, and drops a reader that leaves 4 MB unread", async () => {
    const before = streamStats();
    // A reader that never reads: a raw socket, paused.
    const slow = net.connect((server.address() as AddressInfo).port, "127.0.0.1");
    slow.write(`GET /api/stream HTTP/1.1\r\nHost: 127.0.0.1\r\nAccept: text/event-stream\r\nCookie: ${owner.cookie}\r\n\r\n`);
    slow.once("data", () => slow.pause());

    // A reader that keeps up, on the same scope.
    let fastBytes = 0;
    let fastClosed = false;
    const fast = http.get(`${base}/api/stream`, { headers: { ...SSE, cookie: owner.cookie } }, (res) => {
      res.on("data", (chunk: Buffer) => (fastBytes += chunk.length));
      res.on("close", () => (fastClosed = true));
    });
    await until("both streams open", () => streamStats().streams === before.streams + 2, 10_000);
    expect(streamStats().groups).toBe(before.groups + 1);
    expect(streamStats().hubListeners).toBe(before.hubListeners + 1);

    // Large batches of this farm's readings until the slow reader is dropped (or 80 MB went out).
    const readings = Array.from({ length: 400 }, (_, i) => ({ v: 1, orgId: owner.orgId, tankId, probeId: 1, kind: "ph", ts: Date.now() + i, raw: -20, value: 6.1, quality: "ok" }));
    const payload = JSON.stringify({ v: 1, readings });
    // (A paused socket does not see the server's close; the server's count of open streams does.)
    const slowDropped = () => streamStats().streams === before.streams + 1;
    let sent = 0;
    while (!slowDropped() && sent < (80 * 1024 * 1024) / payload.length) {
      await publisher.publishAsync(topics.reading(owner.orgId, tankId), payload, { qos: 0 });
      sent++;
      if (sent % 20 === 0) await sleep(30);
    }
    await until("the slow reader dropped", slowDropped, 10_000);
    expect(sent * payload.length, "bytes published before the drop").toBeGreaterThan(4 * 1024 * 1024);
    const fastBefore = fastBytes;
    await publisher.publishAsync(topics.reading(owner.orgId, tankId), payload, { qos: 0 });
    await until("the fast reader still streaming", () => fastBytes > fastBefore, 10_000);
    expect(fastClosed).toBe(false);
    expect(streamStats().streams).toBe(before.streams + 1);
    fast.destroy();
    slow.destroy();
    await until("the group gone with its last stream", () => streamStats().groups === before.groups, 10_000);
    expect(streamStats().hubListeners).toBe(before.hubListeners);
  });
});
