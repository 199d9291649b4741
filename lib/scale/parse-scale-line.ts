import { parseBareNumber } from "./parse-bare-number";
import { parseHeaderLine } from "./parse-header-line";
import { parsePrintLine } from "./parse-print-line";
import { parseStatusLine } from "./parse-status-line";
import type { ScaleReading } from "./reading";

/**
 * Reads one line from a scale in any of the families it knows: status-prefixed ("S S …"),
 * comma header ("ST,…"), fixed-width print line ("+   123.45 g"), or a bare number. A line
 * that is none of them is an "error" reading carrying the text, so it can be shown and never
 * saved. A blank line (a scale's spacer) is `null`.
 *
 * @param line - one line, without its CR/LF
 * @example
 * parseScaleLine("S S     100.00 g"); // { kind: "stable", value: "100.00", unit: "g", raw }
 * parseScaleLine("ST,+00123.45  g"); // { kind: "stable", value: "123.45", unit: "g", raw }
 * parseScaleLine("+   123.45 g ?"); // { kind: "unstable", value: "123.45", unit: "g", raw }
 * parseScaleLine("Err 4"); // { kind: "error", note: "Err 4", raw: "Err 4" }
 */
export function parseScaleLine(line: string): ScaleReading | null {
  // Control characters some scales add (STX/ETX, NUL padding) are not part of the reading.
  // eslint-disable-next-line no-control-regex
  const clean = line.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g, "");
  if (clean.trim() === "") return null;
  const reading = parseStatusLine(clean) ??
    parseHeaderLine(clean) ??
    parseBareNumber(clean) ??
    parsePrintLine(clean) ?? { kind: "error" as const, note: clean.trim(), raw: clean };
  return { ...reading, raw: line };
}
