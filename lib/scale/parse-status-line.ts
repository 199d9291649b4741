import type { ScaleReading } from "./reading";
import { readWeightField } from "./weight-field";

const STATUS_LINE = /^S\s+([SDI+-])(?:\s+(.*))?$/;
const ERROR_LINE = /^E[STL]$/;

/**
 * Reads a status-prefixed line: "S S" stable or "S D" still moving, then the weight and unit;
 * "S I" the scale could not answer (busy), "S +" over its capacity, "S -" under zero; "ES",
 * "ET", "EL" a command the scale did not understand.
 *
 * @param line - one line, without its CR/LF
 * @returns the reading, or `null` when the line is not of this family
 * @example
 * parseStatusLine("S S     100.00 g"); // { kind: "stable", value: "100.00", unit: "g", raw }
 * parseStatusLine("S D     100.01 g"); // { kind: "unstable", value: "100.01", unit: "g", raw }
 * parseStatusLine("S +"); // { kind: "overload", raw }
 */
export function parseStatusLine(line: string): ScaleReading | null {
  const raw = line;
  const text = line.trim();
  if (ERROR_LINE.test(text)) return { kind: "error", note: text, raw };
  const m = STATUS_LINE.exec(text);
  if (!m) return null;
  const status = m[1];
  if (status === "+") return { kind: "overload", raw };
  if (status === "-") return { kind: "underload", raw };
  if (status === "I") return { kind: "error", note: "scale busy", raw };
  const field = readWeightField(m[2] ?? "");
  if (!field || field.mark) return { kind: "error", note: text, raw };
  if (field.otherUnit) return { kind: "error", value: field.value, note: field.otherUnit, raw };
  return {
    kind: status === "S" ? "stable" : "unstable",
    value: field.value,
    ...(field.unit ? { unit: field.unit } : {}),
    raw,
  };
}
