import Decimal from "decimal.js";

// How the build record's figures reach a person: lengths at the precision they were typed
// (computed ones with one digit more), angles to a tenth of a degree, loads to the whole pound
// or newton, volumes to a tenth of a cc, ratios to two decimals. Never a raw decimal string.

const D = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_UP });

/** Digits after the point in a decimal string as typed ("0.0150" → 4). */
export function decimalsOf(value: string | null | undefined): number {
  if (!value) return 0;
  const point = value.indexOf(".");
  return point < 0 ? 0 : value.length - point - 1;
}

function fixed(value: string, places: number): string {
  const s = new D(value).toDecimalPlaces(places).toFixed(places);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/** A length worked out from typed ones: one more decimal than the most precise input. */
export function formatDerivedLength(value: string, inputs: (string | null | undefined)[]): string {
  const places = Math.max(0, ...inputs.map(decimalsOf)) + 1;
  return fixed(value, places);
}

/** A length shown at the decimals of the inputs it came from (a sum or difference of them). */
export function formatLengthAsTyped(value: string, inputs: (string | null | undefined)[]): string {
  return fixed(value, Math.max(0, ...inputs.map(decimalsOf)));
}

/** Degrees to a tenth, trailing zeros dropped ("104", "104.5", "-2.3"). */
export function formatAngle(value: string, places = 1): string {
  const s = new D(value).toDecimalPlaces(places).toString();
  return s === "-0" ? "0" : s;
}

/** A spring load to the whole pound or newton. */
export function formatLoad(value: string): string {
  return fixed(value, 0);
}

/** A volume in cc to a tenth. */
export function formatCc(value: string): string {
  return fixed(value, 1);
}

/** A compression ratio as "10.39:1". */
export function formatRatio(value: string): string {
  return `${fixed(value, 2)}:1`;
}

/** A clearance per unit of journal (dimensionless), to four significant figures' worth. */
export function formatPerUnit(value: string): string {
  return fixed(value, 5);
}
