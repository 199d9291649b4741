export { type JobReading, readingAtJobResolution, type ScaleStepFit } from "./at-job-resolution";
export { createLineSplitter, lineSplitStream } from "./line-splitter";
export { createScaleDecoder } from "./scale-decoder";
export { parseBareNumber } from "./parse-bare-number";
export { parseHeaderLine } from "./parse-header-line";
export { parsePrintLine } from "./parse-print-line";
export { parseScaleLine } from "./parse-scale-line";
export { parseStatusLine } from "./parse-status-line";
export type { ScaleReading, ScaleReadingKind } from "./reading";
export {
  type JobMassUnit,
  type JobUnitResult,
  MAX_READING_DECIMALS,
  readingInJobUnit,
} from "./to-job-unit";
export { convertScaleMass, GRAMS_PER_UNIT, readScaleUnit, type ScaleMassUnit } from "./units";
export { readWedgeReadings, type WedgeResult } from "./wedge";
export {
  createReadingGate,
  EMPTY_PAN_DIVISIONS,
  type GateDecision,
  PRINT_PAUSE_MS,
} from "./reading-gate";
