import type { ScaleMassUnit } from "./units";

/** What one line from a scale says. */
export type ScaleReadingKind = "stable" | "unstable" | "overload" | "underload" | "error";

/**
 * One line from a scale, read. `value` is a plain decimal string with the scale's own
 * decimals kept ("100.00"), a leading "-" for a negative reading and no "+" or leading zeros;
 * `unit` is absent when the scale printed none. `raw` is the line as received.
 */
export type ScaleReading = {
  kind: ScaleReadingKind;
  value?: string;
  unit?: ScaleMassUnit;
  /** For an unknown unit or an error line: what the scale printed, in its own words. */
  note?: string;
  raw: string;
};

/**
 * A scale's number as a plain decimal string: "+00123.45" → "123.45", "-.5" → "-0.5",
 * "12." → "12", "-0.00" → "0.00". `null` when it is not a number.
 */
export function normaliseScaleNumber(sign: string, digits: string): string | null {
  const m = /^(\d*)(?:\.(\d*))?$/.exec(digits);
  if (!m || (!m[1] && !m[2])) return null;
  const whole = (m[1] ?? "").replace(/^0+(?=\d)/, "") || "0";
  const fraction = m[2] ? `.${m[2]}` : "";
  const plain = whole + fraction;
  const zero = /^0(\.0*)?$/.test(plain);
  return sign === "-" && !zero ? `-${plain}` : plain;
}
