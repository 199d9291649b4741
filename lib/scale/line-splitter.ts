/**
 * Splits a scale's text stream into lines. Chunks arrive as the port delivers them: a line
 * may be split anywhere, even between the CR and LF of its CRLF. CR, LF and CRLF all end a
 * line; a CR at the end of a chunk waits for the next chunk before it is known whether an LF
 * belongs to it.
 *
 * @example
 * const split = createLineSplitter();
 * split.push("S S   10"); // []
 * split.push("0.00 g\r"); // ["S S   100.00 g"]
 * split.push("\nS D"); // []   (the LF closed nothing new)
 * split.flush(); // ["S D"]
 */
export function createLineSplitter(): {
  /** Adds a chunk and returns the lines it completed, in order. */
  push(chunk: string): string[];
  /** Returns what is left as a last line (end of stream). */
  flush(): string[];
} {
  let pending = "";
  let afterCr = false;
  return {
    push(chunk) {
      const lines: string[] = [];
      for (const ch of chunk) {
        if (ch === "\n") {
          if (afterCr) {
            afterCr = false;
            continue;
          }
          lines.push(pending);
          pending = "";
        } else if (ch === "\r") {
          lines.push(pending);
          pending = "";
          afterCr = true;
        } else {
          afterCr = false;
          pending += ch;
        }
      }
      return lines;
    },
    flush() {
      const rest = pending;
      pending = "";
      afterCr = false;
      return rest === "" ? [] : [rest];
    },
  };
}

/**
 * The splitter as a stream stage: text chunks in (e.g. from a `TextDecoderStream`), lines out.
 *
 * @example
 * port.readable.pipeThrough(new TextDecoderStream()).pipeThrough(lineSplitStream());
 */
export function lineSplitStream(): TransformStream<string, string> {
  const split = createLineSplitter();
  return new TransformStream<string, string>({
    transform(chunk, controller) {
      for (const line of split.push(chunk)) controller.enqueue(line);
    },
    flush(controller) {
      for (const line of split.flush()) controller.enqueue(line);
    },
  });
}
