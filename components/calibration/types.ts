// The JSON the calibration routes return, as the browser sees it.
import type { RunView } from "@/db/queries/calibration-runs";
import type { LiveSnapshot } from "@/db/queries/calibration-live";

export type RunViewJson = RunView;
export type LiveJson = LiveSnapshot & { now: number };
