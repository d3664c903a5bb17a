/**
 * lib/calibration: pure, synchronous pH and EC calibration maths
 * (DOMAIN.md section 6). No I/O.
 */
export { CalibrationInputError, type CalibrationErrorCode } from "./errors";
export { nernstSlopeMv, GAS_CONSTANT, FARADAY_CONSTANT, ZERO_CELSIUS_K } from "./nernst";
export {
  bufferPh,
  BUFFERS,
  BUFFER_IDS,
  type BufferId,
  type BufferInfo,
  type BufferSpec,
  type BufferTable,
} from "./buffers";
export { PH_ACCEPTANCE, judgePhCalibration, type PhJudgement, type Verdict } from "./ph-acceptance";
export {
  fitPh,
  DEFAULT_SLOPE_PCT,
  MIN_BUFFER_SPREAD_PH,
  type PhCalibration,
  type PhFit,
  type PhFitOptions,
  type PhPoint,
} from "./ph-fit";
export { phFromMv } from "./ph-reading";
export {
  ecStandardAt,
  EC_STANDARD_IDS,
  KCL_01_MOLAL_ALPHA,
  KCL_01_MOLAL_EC25,
  LINEAR_STANDARD_RANGE_C,
  MAX_ALPHA_PER_C,
  type CustomEcStandard,
  type EcStandardId,
  type EcStandardSpec,
} from "./ec-standards";
export {
  fitEc,
  ecFromConductance,
  EC_ACCEPTANCE,
  type EcCalibration,
  type EcFit,
  type EcFitInput,
} from "./ec-fit";
export { ecToPpm, ecToCf, type PpmScale } from "./ec-units";
export { fitPhStability, type PhSample, type Stability, type StabilityOptions } from "./stability";
export { suggestNextDue, type AsFoundError, type NextDue, type NextDueInput } from "./drift";
export { calibrationStatus, type CalibrationStatus, type StatusInput } from "./status";
export { DAY_MS } from "./time";
export { fitEcStability, type ConductanceSample, type EcStabilityOptions } from "./ec-stability";
export { runProgress, type RunProgress, type RunProgressInput, type RunStep, type RunStepKey } from "./run-steps";
export { parseStandardText, standardLabel, EC_STANDARD_LABELS } from "./standard-text";
export { DEFAULT_STABILITY_WINDOW_MS, parseStabilityWindowMs } from "./stability-window";
export {
  BUFFER_TABLE_LIMITS,
  bufferTableProblem,
  bufferTableRowsSchema,
  bufferTableSchema,
  bufferTableToRows,
  readBufferTableRows,
  type BufferTableCheck,
  type BufferTableRow,
} from "./buffer-table-input";
