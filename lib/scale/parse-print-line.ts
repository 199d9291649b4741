import type { ScaleReading } from "./reading";
import { markIsStable, readWeightField } from "./weight-field";

const OVERLOAD = /^\+?\s*(OL|O-L|OVER|OVERLOAD)$/i;
const UNDERLOAD = /^(-\s*(OL|O-L)|UL|U-L|UNDER|UNDERLOAD)$/i;

/**
 * Reads a fixed-width print line (16 or 22 characters on most scales): a sign, spaces, the
 * number, an optional unit, then an optional "?" (still moving) or status word ("ST"/"S"
 * stable, "US"/"U"/"D" moving): "+   123.45 g", "-     0.20 g ?", "    1.2345 oz  ST".
 * An overload prints as "+ OL" or "OVER", an underload as "- OL" or "UNDER".
 *
 * @param line - one line, without its CR/LF
 * @returns the reading, or `null` when the line is not of this family
 * @example
 * parsePrintLine("+   123.45 g    "); // { kind: "stable", value: "123.45", unit: "g", raw }
 * parsePrintLine("+   123.47 g  ? "); // { kind: "unstable", value: "123.47", unit: "g", raw }
 */
export function parsePrintLine(line: string): ScaleReading | null {
  const raw = line;
  const text = line.trim();
  if (OVERLOAD.test(text)) return { kind: "overload", raw };
  if (UNDERLOAD.test(text)) return { kind: "underload", raw };
  const field = readWeightField(text);
  if (!field) return null;
  if (field.otherUnit) return { kind: "error", value: field.value, note: field.otherUnit, raw };
  return {
    kind: markIsStable(field.mark) ? "stable" : "unstable",
    value: field.value,
    ...(field.unit ? { unit: field.unit } : {}),
    raw,
  };
}
