// The demo scenario: an invented farm, for the demo only. Every value here is made up.
import type { Role } from "../schema";
import type { CropPreset } from "../../lib/settings/crop-presets";

export const DEMO_PASSWORD = "tidewell-demo";

export const DEMO_ORG = "Larkspur Valley Growers";

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: "owner@larkspur.example", name: "Maren Okafor", role: "owner" },
  { email: "grower@larkspur.example", name: "Tomas Reyes", role: "grower" },
  { email: "night@larkspur.example", name: "Priya Lindqvist", role: "night_manager" },
];

/** How the pH probe's calibration record looks at seed time. */
export type CalibrationStory =
  | { kind: "current"; daysAgo: number }
  | { kind: "rejected-then-accepted"; daysAgo: number }
  | { kind: "never"; installedDaysAgo: number };

export interface TankSpec {
  key: string;
  name: string;
  crop: CropPreset;
  controllerId: string;
  calibration: CalibrationStory;
  /** Override of the crop preset (plugs run weaker than grown plants). */
  band?: Partial<{ phMin: number; phMax: number; ecMinUs: number; ecMaxUs: number }>;
}

export interface SiteSpec {
  name: string;
  timeZone: string;
  zones: { name: string; tanks: TankSpec[] }[];
}

export const DEMO_SITES: SiteSpec[] = [
  {
    name: "North Greenhouse",
    timeZone: "Europe/Dublin",
    zones: [
      {
        name: "House 1 · lettuce",
        tanks: [
          { key: "L1", name: "L1 Butterhead", crop: "leafy greens", controllerId: "ctl-north-l1", calibration: { kind: "current", daysAgo: 4 } },
          { key: "L2", name: "L2 Oakleaf", crop: "leafy greens", controllerId: "ctl-north-l2", calibration: { kind: "current", daysAgo: 27 } },
          { key: "L3", name: "L3 Romaine", crop: "leafy greens", controllerId: "ctl-north-l3", calibration: { kind: "current", daysAgo: 41 } },
        ],
      },
      {
        name: "House 2 · herbs and greens",
        tanks: [
          { key: "G1", name: "G1 Genovese basil", crop: "basil and herbs", controllerId: "ctl-north-g1", calibration: { kind: "rejected-then-accepted", daysAgo: 6 } },
          { key: "G2", name: "G2 Rocket", crop: "leafy greens", controllerId: "ctl-north-g2", calibration: { kind: "current", daysAgo: 12 } },
          { key: "G3", name: "G3 Pak choi", crop: "leafy greens", controllerId: "ctl-north-g3", calibration: { kind: "current", daysAgo: 18 } },
        ],
      },
    ],
  },
  {
    name: "Propagation House",
    timeZone: "Europe/Dublin",
    zones: [
      {
        name: "Nursery bench",
        tanks: [
          {
            key: "P1",
            name: "P1 Lettuce plugs",
            crop: "leafy greens",
            controllerId: "ctl-prop-p1",
            calibration: { kind: "never", installedDaysAgo: 3 },
            band: { ecMinUs: 600, ecMaxUs: 1000 },
          },
          { key: "P2", name: "P2 Strawberry runners", crop: "strawberry", controllerId: "ctl-prop-p2", calibration: { kind: "current", daysAgo: 9 } },
        ],
      },
    ],
  },
];

/** Past incidents, all resolved, each matched by a disturbance in the seeded history. */
export interface PastIncident {
  tank: string;
  cause: string;
  measure: "ph" | "ec" | "temp" | null;
  daysAgo: number;
  hour: number; // UTC hour it opened
  message: string;
  ackAfterMin: number;
  ackBy: Role;
  resolveAfterMin: number;
  resolvedBy: Role | "auto";
  note?: string;
  /** Shift of the true value during the incident window, in the measure's unit. */
  disturbance?: number;
}

export const PAST_INCIDENTS: PastIncident[] = [
  {
    tank: "L2", cause: "out-of-band", measure: "ph", daysAgo: 9, hour: 2,
    message: "pH 6.84 above the 6.5 target band", ackAfterMin: 7, ackBy: "night_manager",
    resolveAfterMin: 48, resolvedBy: "grower", note: "Acid line kinked at the dosing pump; straightened and primed.", disturbance: 0.55,
  },
  {
    tank: "P2", cause: "stale", measure: "ec", daysAgo: 15, hour: 14,
    message: "No EC reading for 4 minutes", ackAfterMin: 12, ackBy: "grower", resolveAfterMin: 25, resolvedBy: "auto",
    note: "Controller lost Wi-Fi after a router restart.",
  },
  {
    tank: "L1", cause: "rate-of-change", measure: "ec", daysAgo: 3, hour: 10,
    message: "EC rose 0.62 mS/cm in one minute", ackAfterMin: 3, ackBy: "grower", resolveAfterMin: 20, resolvedBy: "grower",
    note: "Concentrate B dosed twice by hand; diluted with fresh water.", disturbance: 450,
  },
  {
    tank: "G3", cause: "hold-overrun", measure: null, daysAgo: 20, hour: 9,
    message: "Hold placed for calibration ran 45 minutes past its planned end", ackAfterMin: 4, ackBy: "grower",
    resolveAfterMin: 15, resolvedBy: "grower", note: "Forgot to release after the EC standard; released.",
  },
  {
    tank: "G1", cause: "calibration-rejected", measure: "ph", daysAgo: 6, hour: 11,
    message: "pH calibration rejected: slope 86.1 % is below the 90 % minimum", ackAfterMin: 2, ackBy: "grower",
    resolveAfterMin: 35, resolvedBy: "grower", note: "Cleaned the bulb in enzyme cleaner, recalibrated: accepted.",
  },
];
