import { normaliseScaleNumber, type ScaleReading } from "./reading";

const BARE = /^([+-]?)(\d+(?:\.\d*)?|\.\d+)$/;

/**
 * Reads a line that is only a number ("123.45", "+0123.45"): scales set to send a bare figure
 * send it when it is stable or when asked to print, so it reads as stable, in no unit (the
 * job's own).
 *
 * @param line - one line, without its CR/LF
 * @returns the reading, or `null` when the line is not a bare number
 * @example
 * parseBareNumber("0498.6"); // { kind: "stable", value: "498.6", raw: "0498.6" }
 */
export function parseBareNumber(line: string): ScaleReading | null {
  const m = BARE.exec(line.trim());
  if (!m) return null;
  const value = normaliseScaleNumber(m[1] ?? "", m[2] ?? "");
  return value === null ? null : { kind: "stable", value, raw: line };
}
