// Broker identities: client ids that name exactly one principal, and the failed-connect throttle.
import { describe, expect, it } from "vitest";
import { ConnectThrottle } from "@/ingest/broker/connect-throttle";
import { CONTROLLER_ID_PATTERN, deviceClientId, deviceClientIdAllowed, serviceClientId, serviceClientIdAllowed } from "@/ingest/topics";

describe("device client ids", () => {
  it("are the controller id itself or `{controllerId}:{session}`", () => {
    expect(deviceClientIdAllowed("ctl-north", "ctl-north")).toBe(true);
    expect(deviceClientIdAllowed(deviceClientId("ctl-north", "sim-4711"), "ctl-north")).toBe(true);
    expect(deviceClientIdAllowed("ctl-north:", "ctl-north")).toBe(false);
    expect(deviceClientIdAllowed("ctl-north:a:b", "ctl-north")).toBe(false);
    expect(deviceClientIdAllowed("ctl-north:tidewell ingest", "ctl-north")).toBe(false);
  });

  it("cannot be another controller's, however the ids are prefixed", () => {
    // ctl-north may not present itself as ctl-north-l1 (and so knock that controller offline).
    expect(deviceClientIdAllowed("ctl-north-l1", "ctl-north")).toBe(false);
    expect(deviceClientIdAllowed("ctl-north-l1:x", "ctl-north")).toBe(false);
    expect(deviceClientIdAllowed("ctl-north", "ctl-north-l1")).toBe(false);
    // The separator cannot occur in a controller id, so the owner of a client id is unambiguous.
    expect(CONTROLLER_ID_PATTERN.test("ctl-north:l1")).toBe(false);
  });
});

describe("service client ids", () => {
  it("belong to one account each", () => {
    expect(serviceClientIdAllowed("ingest", "tidewell-ingest")).toBe(true);
    expect(serviceClientIdAllowed("ingest", "tidewell-ingest-2")).toBe(true);
    expect(serviceClientIdAllowed("web", "tidewell-ingest")).toBe(false);
    expect(serviceClientIdAllowed("simulator", "tidewell-ingest-2")).toBe(false);
    expect(serviceClientIdAllowed("web", "tidewell-webby")).toBe(false);
    expect(serviceClientIdAllowed("web", serviceClientId("web", "123-abc"))).toBe(true);
  });
});

describe("failed-connect throttle", () => {
  const limits = { freeFailures: 3, concurrent: 1, windowMs: 60_000, baseBlockMs: 1_000, maxBlockMs: 8_000 };

  it("refuses a key after its free failures, for a doubling interval up to the cap", () => {
    const t = new ConnectThrottle(limits);
    const now = 1_000_000;
    t.failed("a", now);
    t.failed("a", now);
    expect(t.blockedFor("a", now)).toBe(0);
    t.failed("a", now);
    expect(t.blockedFor("a", now)).toBe(1_000);
    t.failed("a", now + 1_000);
    expect(t.blockedFor("a", now + 1_000)).toBe(2_000);
    for (let i = 0; i < 10; i++) t.failed("a", now + 2_000);
    expect(t.blockedFor("a", now + 2_000)).toBe(8_000);
    expect(t.blockedFor("b", now)).toBe(0);
  });

  it("forgets failures after the window, and on success", () => {
    const t = new ConnectThrottle(limits);
    t.failed("a", 0);
    t.failed("a", 0);
    t.failed("a", 61_001);
    expect(t.blockedFor("a", 61_001)).toBe(0);
    t.failed("a", 61_002);
    t.failed("a", 61_003);
    expect(t.blockedFor("a", 61_003)).toBeGreaterThan(0);
    t.succeeded("a");
    expect(t.blockedFor("a", 61_003)).toBe(0);
  });

  it("lets checks of one key take turns", async () => {
    const t = new ConnectThrottle(limits);
    const order: string[] = [];
    const first = await t.turn("a");
    const second = t.turn("a").then((release) => (order.push("second"), release));
    const other = await t.turn("b"); // another key is not held up
    order.push("other");
    await new Promise((r) => setTimeout(r, 10));
    order.push("first done");
    first();
    (await second)();
    other();
    expect(order).toEqual(["other", "first done", "second"]);
  });
});
