/**
 * Counterpoise engine build computations: ring gaps, cam degreeing, true TDC, valve springs,
 * bearing clearances, deck height and compression ratio. Pure and exact like `lib/balance`:
 * every quantity in and out is a decimal string; Decimal (decimal.js) is used only inside.
 * Linear formulas are unit-agnostic (consistent units in, the same unit out); where lengths
 * make volumes, lengths are mm (or inches when `lengthUnit: "in"` is given) and volumes cc.
 * Angles are crank degrees unless a field says cam degrees.
 */
export { AssemblyInputError, isAssemblyInputError, type AssemblyErrorCode } from "./errors";
export {
  INTERNAL_PRECISION,
  RESULT_SIGNIFICANT_DIGITS,
  MAX_INPUT_SIGNIFICANT_DIGITS,
  MILLIMETRES_PER_INCH,
} from "./decimal";
export { LENGTH_UNITS, type AssemblyLengthUnit } from "./units";
export {
  ringEndGap,
  type RingEndGapInput,
  type RingEndGapResult,
  type RingGapStatus,
} from "./ring-end-gap";
export { camFromCard, type CamCardInput, type CamCardResult } from "./cam-from-card";
export {
  intakeCentreline,
  type IntakeCentrelineInput,
  type IntakeCentrelineResult,
  type CamPhasing,
} from "./intake-centreline";
export {
  camCorrection,
  type CamCorrectionInput,
  type CamCorrectionResult,
  type CamMoveDirection,
} from "./cam-correction";
export {
  toDegreesAtdc,
  WHEEL_MARKS,
  type WheelMark,
  type WheelReadingInput,
} from "./wheel-reading";
export { trueTdc, type TrueTdcInput, type TrueTdcResult } from "./true-tdc";
export { valveSpring, type ValveSpringInput, type ValveSpringResult } from "./valve-spring";
export {
  journalGeometry,
  type DiameterReadings,
  type JournalGeometryInput,
  type JournalGeometryResult,
} from "./journal-geometry";
export {
  bearingClearance,
  type BearingClearanceInput,
  type BearingClearanceResult,
  type ClearanceStatus,
} from "./bearing-clearance";
export {
  compressionRatio,
  type CompressionRatioInput,
  type CompressionRatioResult,
} from "./compression-ratio";
export { deckClearance, type DeckClearanceInput, type DeckClearanceResult } from "./deck-clearance";
export {
  pistonPosition,
  type PistonPositionInput,
  type PistonPositionResult,
} from "./piston-position";
export {
  dynamicCompressionRatio,
  type DynamicCompressionRatioInput,
  type DynamicCompressionRatioResult,
} from "./dynamic-compression-ratio";
