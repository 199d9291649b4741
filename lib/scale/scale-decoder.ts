import { createLineSplitter } from "./line-splitter";
import { parseScaleLine } from "./parse-scale-line";
import type { ScaleReading } from "./reading";

/**
 * Bytes from a serial port in, readings out: decodes the text (a character split between two
 * chunks waits for the rest), splits it into lines and reads each line. Blank lines are
 * dropped; every other line gives one reading, in order, whatever the chunking.
 *
 * @example
 * const decoder = createScaleDecoder();
 * decoder.push(new TextEncoder().encode("S S     498.6")); // []
 * decoder.push(new TextEncoder().encode("0 g\r\n")); // [{ kind: "stable", value: "498.60", unit: "g", raw: "S S     498.60 g" }]
 */
export function createScaleDecoder(): {
  push(bytes: Uint8Array): ScaleReading[];
  flush(): ScaleReading[];
} {
  const text = new TextDecoder();
  const lines = createLineSplitter();
  const read = (found: string[]) =>
    found.map(parseScaleLine).filter((r): r is ScaleReading => r !== null);
  return {
    push: (bytes) => read(lines.push(text.decode(bytes, { stream: true }))),
    flush: () => read([...lines.push(text.decode()), ...lines.flush()]),
  };
}
