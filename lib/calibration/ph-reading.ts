import { requireFinite, requireSlopePct } from "./guards";
import { nernstSlopeMv } from "./nernst";
import type { PhCalibration } from "./ph-fit";

/**
 * pH from a probe's mV at the sample's temperature:
 * pH = 7 + (E0 − E) / (s·k(t)). Using the sample's own temperature in k(t) is
 * the automatic temperature compensation of the electrode slope.
 */
export function phFromMv(mv: number, tempC: number, calibration: PhCalibration): number {
  const e = requireFinite(mv, "Millivolts");
  const k = nernstSlopeMv(tempC);
  const slopePct = requireSlopePct(calibration.slopePct, "The calibration slope");
  const e0 = requireFinite(calibration.offsetMv, "The calibration offset");
  return 7 + (e0 - e) / ((slopePct / 100) * k);
}
