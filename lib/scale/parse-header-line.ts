import type { ScaleReading } from "./reading";
import { readWeightField } from "./weight-field";

const HEADER_LINE = /^(ST|US|OL|UL)\s*,(.*)$/i;

/**
 * Reads a comma-separated header line: "ST" stable, "US" unstable, "OL" overload, "UL"
 * underload, then optional fields such as gross/net ("GS", "NT"), then the weight with its
 * sign, leading zeros and unit: "ST,+00123.45  g", "US,GS,+00123.47  g", "OL,+9999999 g".
 *
 * @param line - one line, without its CR/LF
 * @returns the reading, or `null` when the line is not of this family
 * @example
 * parseHeaderLine("ST,+00123.45  g"); // { kind: "stable", value: "123.45", unit: "g", raw }
 * parseHeaderLine("OL,+9999999 g"); // { kind: "overload", raw }
 */
export function parseHeaderLine(line: string): ScaleReading | null {
  const raw = line;
  const m = HEADER_LINE.exec(line.trim());
  if (!m) return null;
  const header = (m[1] ?? "").toUpperCase();
  if (header === "OL") return { kind: "overload", raw };
  if (header === "UL") return { kind: "underload", raw };
  const fields = (m[2] ?? "").split(",");
  const field = readWeightField(fields[fields.length - 1] ?? "");
  if (!field || field.mark) return { kind: "error", note: line.trim(), raw };
  if (field.otherUnit) return { kind: "error", value: field.value, note: field.otherUnit, raw };
  return {
    kind: header === "ST" ? "stable" : "unstable",
    value: field.value,
    ...(field.unit ? { unit: field.unit } : {}),
    raw,
  };
}
