// Turns `alert_rules` rows into lib/alerts settings. A row is one cause: `enabled`, and
// `settings` whose keys are paths inside that cause's section of RuleSettings, e.g. for
// "out-of-band" `{ "fireDelayMs": 60000 }`, for "rate-of-change" `{ "maxPerMinute.ph": 0.3 }`.
// A key that starts with a section name is a full path instead, so sections that belong to no
// single cause can be set too: `{ "settling.afterReleaseMs": 300000 }` on the hold-overrun row.
// Org-wide rows (tank_id null) apply first, then the tank's own rows.
import { DEFAULT_RULE_SETTINGS, mergeSettings, type Cause, type DeepPartial, type RuleSettings } from "../../lib/alerts";
import type { Role } from "../../db/schema";

const SECTION: Record<Cause, keyof RuleSettings> = {
  "out-of-band": "outOfBand",
  "rate-of-change": "rateOfChange",
  stale: "stale",
  flatline: "flatline",
  implausible: "implausible",
  "calibration-due-soon": "calibration",
  "calibration-lapsed": "calibration",
  "calibration-rejected": "calibration",
  "probe-replace": "calibration",
  "buffer-like": "bufferLike",
  "out-of-solution": "outOfSolution",
  "hold-overrun": "hold",
  "dosing-inhibit-overrun": "dosingInhibit",
};

export interface AlertRuleRow {
  tankId: number | null;
  cause: string;
  enabled: boolean;
  settings: Record<string, number>;
  lapsedRouteRole: Role | null;
}

function setPath(target: Record<string, unknown>, path: string[], value: number) {
  let node = target;
  for (const key of path.slice(0, -1)) {
    node[key] ??= {};
    node = node[key] as Record<string, unknown>;
  }
  node[path[path.length - 1]] = value;
}

function partialOf(rows: AlertRuleRow[]): DeepPartial<RuleSettings> {
  const out: Record<string, unknown> = { causes: {} };
  for (const row of rows) {
    const section = SECTION[row.cause as Cause];
    if (!section) continue;
    (out.causes as Record<string, unknown>)[row.cause] = { enabled: row.enabled };
    for (const [key, value] of Object.entries(row.settings ?? {})) {
      if (typeof value !== "number" || !Number.isFinite(value)) continue;
      const path = key.split(".");
      setPath(out, path[0] in DEFAULT_RULE_SETTINGS ? path : [section, ...path], value);
    }
  }
  return out as DeepPartial<RuleSettings>;
}

export interface TankRules {
  settings: RuleSettings;
  /** Where alerts on readings from a lapsed calibration go, per cause, when set. */
  lapsedRoute: Partial<Record<Cause, Role>>;
}

export function tankRules(rows: AlertRuleRow[], tankId: number): TankRules {
  const orgRows = rows.filter((r) => r.tankId === null);
  const own = rows.filter((r) => r.tankId === tankId);
  const settings = mergeSettings(partialOf(own), mergeSettings(partialOf(orgRows)));
  const lapsedRoute: Partial<Record<Cause, Role>> = {};
  for (const r of [...orgRows, ...own]) if (r.lapsedRouteRole) lapsedRoute[r.cause as Cause] = r.lapsedRouteRole;
  return { settings, lapsedRoute };
}
