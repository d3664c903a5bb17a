// The runner's pure helpers: who is on shift at a site, and alert_rules rows → lib/alerts settings.
import { describe, expect, it } from "vitest";
import { DEFAULT_RULE_SETTINGS } from "@/lib/alerts";
import { isDayShift, localParts, onShift } from "@/ingest/alerts/shifts";
import { tankRules, type AlertRuleRow } from "@/ingest/alerts/rule-settings";

const dublin = { timeZone: "Europe/Dublin", dayStartHour: 7, nightStartHour: 19, dayRole: "grower", nightRole: "night_manager" } as const;

describe("shifts in the site's time zone", () => {
  it("follows the site's clock, summer time included (IANA tz database: Europe/Dublin is UTC+1 in summer, UTC+0 in winter)", () => {
    expect(localParts(Date.UTC(2026, 11, 1, 6, 30), "Europe/Dublin")).toEqual({ date: "2026-12-01", hour: 6 });
    expect(localParts(Date.UTC(2026, 6, 1, 6, 30), "Europe/Dublin")).toEqual({ date: "2026-07-01", hour: 7 });
    expect(isDayShift(dublin, Date.UTC(2026, 11, 1, 6, 30))).toBe(false);
    expect(isDayShift(dublin, Date.UTC(2026, 6, 1, 6, 30))).toBe(true);
    expect(onShift(dublin, Date.UTC(2026, 11, 1, 19, 0))).toEqual({ shift: "night", role: "night_manager" });
    expect(onShift(dublin, Date.UTC(2026, 11, 1, 18, 59))).toEqual({ shift: "day", role: "grower" });
  });

  it("a day shift that wraps past midnight", () => {
    const wrap = { ...dublin, timeZone: "UTC", dayStartHour: 20, nightStartHour: 4 };
    expect(isDayShift(wrap, Date.UTC(2026, 0, 1, 23))).toBe(true);
    expect(isDayShift(wrap, Date.UTC(2026, 0, 1, 3))).toBe(true);
    expect(isDayShift(wrap, Date.UTC(2026, 0, 1, 12))).toBe(false);
  });
});

describe("alert rules", () => {
  const row = (r: Partial<AlertRuleRow> & { cause: string }): AlertRuleRow => ({ tankId: null, enabled: true, settings: {}, lapsedRouteRole: null, ...r });

  it("org-wide rows apply to every tank; a tank's own rows win", () => {
    const rows = [
      row({ cause: "out-of-band", settings: { fireDelayMs: 60_000 }, lapsedRouteRole: "grower" }),
      row({ cause: "rate-of-change", settings: { "maxPerMinute.ph": 0.3 } }),
      row({ tankId: 7, cause: "out-of-band", settings: { fireDelayMs: 5_000 } }),
      row({ tankId: 7, cause: "flatline", enabled: false }),
      row({ tankId: 7, cause: "hold-overrun", settings: { "settling.afterReleaseMs": 15_000, overrunGraceMs: 60_000 } }),
    ];
    const other = tankRules(rows, 3);
    expect(other.settings.outOfBand.fireDelayMs).toBe(60_000);
    expect(other.settings.rateOfChange.maxPerMinute).toEqual({ ...DEFAULT_RULE_SETTINGS.rateOfChange.maxPerMinute, ph: 0.3 });
    expect(other.settings.causes.flatline.enabled).toBe(true);
    expect(other.lapsedRoute).toEqual({ "out-of-band": "grower" });

    const own = tankRules(rows, 7);
    expect(own.settings.outOfBand.fireDelayMs).toBe(5_000);
    expect(own.settings.outOfBand.clearDelayMs).toBe(DEFAULT_RULE_SETTINGS.outOfBand.clearDelayMs);
    expect(own.settings.causes.flatline.enabled).toBe(false);
    expect(own.settings.settling.afterReleaseMs).toBe(15_000);
    expect(own.settings.hold.overrunGraceMs).toBe(60_000);
  });

  it("ignores unknown causes and non-numeric values", () => {
    const s = tankRules([row({ cause: "no-such-cause", settings: { x: 1 } }), row({ cause: "stale", settings: { afterMs: Number.NaN } })], 1).settings;
    expect(s).toEqual(DEFAULT_RULE_SETTINGS);
  });
});
