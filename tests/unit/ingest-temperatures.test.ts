// The ingest's recent solution temperatures per tank, which compensate pH and EC samples.
import { describe, expect, it } from "vitest";
import { TankTemperatures } from "@/ingest/worker/temperatures";

describe("tank temperatures", () => {
  it("gives the temperature at or before a time, else the oldest known, else null", () => {
    const t = new TankTemperatures();
    expect(t.at(1, 1000)).toBeNull();
    t.record(1, 1000, 20);
    t.record(1, 3000, 22);
    t.record(1, 2000, 21); // late: slotted in by time
    expect([t.at(1, 999), t.at(1, 1000), t.at(1, 2500), t.at(1, 9999)]).toEqual([20, 20, 21, 22]);
    t.record(1, 2000, 21.5); // the same time again replaces it
    expect(t.at(1, 2000)).toBe(21.5);
    expect(t.at(2, 2000)).toBeNull();
  });

  it("keeps a long run of samples bounded, and always the most recent ones", () => {
    const t = new TankTemperatures();
    for (let i = 0; i < 10_000; i++) t.record(1, i * 1000, 15 + (i % 10));
    expect(t.at(1, 9_999_000)).toBe(15 + (9999 % 10));
    expect(t.at(1, 9_950_000)).toBe(15 + (9950 % 10)); // 50 samples back is still known exactly
    const history = (t as unknown as { byTank: Map<number, unknown[]> }).byTank.get(1)!;
    expect(history.length).toBeLessThanOrEqual(128);
  });
});
