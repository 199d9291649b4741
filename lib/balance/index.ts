/**
 * Counterpoise balance engine: the trade's computations, pure and exact. Every quantity in
 * and out is a decimal string; Decimal (decimal.js) is used only inside. Units: masses in
 * g (or the job's unit), lengths and radii in mm, densities in g/cm³, speeds in rpm, rotor
 * mass in kg, accelerations in m/s², forces in N, unbalance in g·mm.
 */
export { BalanceInputError, isBalanceInputError, type BalanceErrorCode } from "./errors";
export {
  INTERNAL_PRECISION,
  RESULT_SIGNIFICANT_DIGITS,
  MAX_INPUT_SIGNIFICANT_DIGITS,
} from "./decimal";
export {
  convertMass,
  convertLength,
  GRAMS_PER_OUNCE,
  GRAMS_PER_GRAIN,
  MILLIMETRES_PER_INCH,
  CONVERSION_RELATIVE_TOLERANCE,
  MASS_UNITS,
  LENGTH_UNITS,
  type MassUnit,
  type LengthUnit,
} from "./units";
export {
  formatMass,
  formatDerivedMass,
  formatUnbalance,
  formatLength,
  formatLengthIn,
  lengthResolutionOf,
  massDecimals,
  isScaleDivision,
  DERIVED_MASS_EXTRA_DECIMALS,
  UNBALANCE_SIGNIFICANT_FIGURES,
  MAX_LENGTH_DECIMALS,
} from "./display";
export { convertMassSetting, SETTING_SIGNIFICANT_FIGURES } from "./convert-mass-setting";
export {
  LAYOUT_PRESETS,
  findLayoutPreset,
  CUSTOM_DEFAULT_BALANCE_FACTOR,
  type LayoutPreset,
  type FixedLayoutPreset,
  type CustomLayoutPreset,
} from "./layouts";
export {
  matchSet,
  DEFAULT_TOLERANCE_G,
  type PartStatus,
  type MatchSetInput,
  type MatchSetResult,
  type MatchedPart,
} from "./match-set";
export { bobweightForCrankpin, type BobweightInput } from "./bobweight";
export {
  bobweightToBuild,
  type BobweightToBuildInput,
  type BobweightSet,
  type PinBobweight,
} from "./build-to";
export {
  computeBalance,
  MACHINED_KINDS,
  MATCHING_MODES,
  MATCHED_KINDS,
  RECIPROCATING_KINDS,
  DEFAULT_RESOLUTION_G,
  DEFAULT_TOLERANCE_OZ,
  DEFAULT_RESOLUTION_OZ,
  type BalanceInput,
  type BalanceResult,
  type BalanceMassUnit,
  type BalanceWarning,
  type BalanceWarningCode,
  type BobweightResult,
  type CylinderInput,
  type CylinderResult,
  type LayoutInput,
  type MatchedKind,
  type PartKind,
  type PartResult,
  type AssemblyResult,
  type MatchingMode,
  type WeightInput,
} from "./compute-balance";
export { removalTotal } from "./removal-total";
export { removalSaving, type RemovalSaving } from "./removal-saving";
export {
  suggestPairing,
  type PairingInput,
  type PairingCylinderInput,
  type PairingResult,
  type PairingAssignment,
} from "./pairing";
export {
  permissibleUnbalance,
  BALANCE_GRADES,
  PLANE_SHARE_MIN,
  PLANE_SHARE_MAX,
  type BalanceGrade,
  type PermissibleUnbalanceInput,
  type PermissibleUnbalance,
  type PlaneAllowance,
} from "./permissible-unbalance";
export {
  checkResidual,
  type CheckResidualInput,
  type ResidualReading,
  type ResidualCheck,
  type PlaneCheck,
} from "./check-residual";
export {
  drillDepthForMass,
  DEFAULT_POINT_ANGLE_DEG,
  type DrillDepthInput,
  type DrillDepth,
} from "./drill-depth";
export {
  parseDrillSize,
  NUMBER_DRILL_INCHES,
  LETTER_DRILL_INCHES,
  MAX_DRILL_DIAMETER_MM,
  type DrillSize,
  type DrillSizeKind,
} from "./drill-sizes";
export { plugNetMass, type PlugNetMassInput, type PlugNetMass } from "./plug-net-mass";
export { moveCorrection, type MoveCorrectionInput, type MovedCorrection } from "./move-correction";
export {
  splitCorrection,
  type SplitCorrectionInput,
  type SplitCorrection,
} from "./split-correction";
export {
  reciprocatingLoads,
  type ReciprocatingLoadsInput,
  type ReciprocatingLoads,
} from "./reciprocating-loads";
export { MATERIAL_DENSITIES, type MaterialDensity, type MaterialId } from "./materials";
export {
  checkPlausibility,
  DEFAULT_OUTLIER_PERCENT,
  type Plausibility,
  type PlausibilityInput,
  type PlausibilityWeight,
} from "./plausibility";
