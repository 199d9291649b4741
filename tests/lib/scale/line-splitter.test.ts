import { readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createLineSplitter, createScaleDecoder, lineSplitStream } from "@/lib/scale";

const recordings = [
  "status-prefixed.txt",
  "comma-header.txt",
  "print-16.txt",
  "print-22.txt",
  "bare-number.txt",
].map((name) => readFileSync(join(__dirname, "fixtures", name)));

/** Cuts bytes at the given offsets (any order, duplicates allowed: empty chunks too). */
function cut(bytes: Uint8Array, offsets: number[]): Uint8Array[] {
  const points = [...new Set(offsets.map((o) => o % (bytes.length + 1)))].sort((a, b) => a - b);
  const chunks: Uint8Array[] = [];
  let from = 0;
  for (const p of [...points, bytes.length]) {
    chunks.push(bytes.slice(from, p));
    from = p;
  }
  return chunks;
}

function decodeAll(chunks: Uint8Array[]) {
  const decoder = createScaleDecoder();
  return [...chunks.flatMap((c) => decoder.push(c)), ...decoder.flush()];
}

describe("line splitter", () => {
  it("ends a line at CR, LF or CRLF, and a CRLF split between chunks is one line end", () => {
    const split = createLineSplitter();
    expect(split.push("S S   10")).toEqual([]);
    expect(split.push("0.00 g\r")).toEqual(["S S   100.00 g"]);
    expect(split.push("\nS D  1.0 g\nST,+1 g\r")).toEqual(["S D  1.0 g", "ST,+1 g"]);
    expect(split.push("x")).toEqual([]);
    expect(split.flush()).toEqual(["x"]);
  });

  it("works as a stream stage", async () => {
    const source = new ReadableStream<string>({
      start(c) {
        c.enqueue("12.3\r");
        c.enqueue("\n45");
        c.enqueue(".6\n7");
        c.close();
      },
    });
    const lines: string[] = [];
    const reader = source.pipeThrough(lineSplitStream()).getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      lines.push(value);
    }
    expect(lines).toEqual(["12.3", "45.6", "7"]);
  });
});

describe("any chunking of a recorded stream", () => {
  it("gives the same readings as the stream in one piece", () => {
    for (const bytes of recordings) {
      const whole = decodeAll([bytes]);
      expect(whole.length).toBeGreaterThanOrEqual(3);
      fc.assert(
        fc.property(fc.array(fc.nat(), { maxLength: 40 }), (offsets) => {
          expect(decodeAll(cut(bytes, offsets))).toEqual(whole);
        }),
        { numRuns: 200 },
      );
    }
  });

  it("byte by byte, with the recordings run together", () => {
    const all = Buffer.concat(recordings);
    const one = decodeAll([all]);
    expect(decodeAll([...all].map((b) => Uint8Array.of(b)))).toEqual(one);
  });

  it("a character of two bytes split between chunks is decoded whole", () => {
    const bytes = new TextEncoder().encode("Err \u00b5\r\n");
    expect(decodeAll(cut(bytes, [5]))).toEqual(decodeAll([bytes]));
    expect(decodeAll([bytes])[0]?.note).toBe("Err \u00b5");
  });
});
