import type { ScaleReadingKind } from "./reading";
import { ScaleDecimal } from "./units";

/** Scale divisions around zero that count as an empty pan. */
export const EMPTY_PAN_DIVISIONS = 10;

/** A pause in the stream longer than this (ms) means the next line was printed on purpose. */
export const PRINT_PAUSE_MS = 1000;

export type GateDecision = "hand" | "hold" | "skip";

/**
 * Decides which stable readings go into a weigh box, so a part is entered once however many
 * times a streaming scale repeats its weight. A stable reading is handed over when the pan has
 * been emptied since the last one (a reading within {@link EMPTY_PAN_DIVISIONS} divisions of
 * zero), when it follows a pause of more than {@link PRINT_PAUSE_MS} (a scale that prints on
 * its key or on request), or when a print was asked for. Otherwise it is held: the same part
 * still on the pan, or a new part put on without emptying the pan.
 *
 * @param resolution - the job's scale resolution in the job's unit, e.g. "0.1"
 * @example
 * const gate = createReadingGate("0.1");
 * gate.offer({ kind: "stable", value: "498.6" }, 0); // "hand"
 * gate.offer({ kind: "stable", value: "498.6" }, 100); // "hold"  (still on the pan)
 * gate.offer({ kind: "stable", value: "0.0" }, 200); // "skip"   (emptied: the next one is handed)
 * gate.offer({ kind: "stable", value: "512.3" }, 300); // "hand"
 */
export function createReadingGate(resolution: string) {
  const emptyBand = new ScaleDecimal(resolution).times(EMPTY_PAN_DIVISIONS);
  let armed = true;
  let printAsked = false;
  let lastAt = Number.NEGATIVE_INFINITY;
  return {
    /** The next stable reading is the answer to a print command: hand it over. */
    askPrint() {
      printAsked = true;
    },
    /** The handed reading found no box to go into: the next stable reading is handed instead. */
    unused() {
      armed = true;
    },
    /**
     * @param reading - a reading already in the job's unit
     * @param at - when it arrived, in milliseconds
     */
    offer(reading: { kind: ScaleReadingKind; value?: string }, at: number): GateDecision {
      const pause = at - lastAt;
      lastAt = at;
      if (reading.value === undefined) return "skip";
      const value = new ScaleDecimal(reading.value);
      if (value.abs().lessThanOrEqualTo(emptyBand)) {
        if (reading.kind === "stable" || reading.kind === "unstable") armed = true;
        return "skip";
      }
      if (reading.kind !== "stable" || value.isNegative()) return "skip";
      if (armed || printAsked || pause > PRINT_PAUSE_MS) {
        armed = false;
        printAsked = false;
        return "hand";
      }
      return "hold";
    },
  };
}
