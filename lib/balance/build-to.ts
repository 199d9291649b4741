import { Dec, out } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseInteger, parseQuantity } from "./parse";

/** One crankpin's bobweight, as {@link computeBalance} gives it in `bobweights`. */
export interface PinBobweight {
  crankpin: number;
  /** The cylinders whose rods run on the pin: how many rods the bobweight stands for. */
  cylinders: readonly number[];
  /** The pin's bobweight, g or oz. */
  mass: string;
}

export interface BobweightToBuildInput {
  bobweights: readonly PinBobweight[];
  /** The scale resolution in the same unit, e.g. "0.1": a wider spread is worth a warning. */
  resolution: string;
}

/** The one set of bobweights to build for the pins that carry the same number of rods. */
export interface BobweightSet {
  /** Rods on each pin of the set (2 on a cross-plane V8, 1 on a split-pin V6). */
  rodsPerPin: number;
  /** The pins and their own figures, by crankpin. */
  pins: { crankpin: number; mass: string }[];
  /** The figure to build to: the mean of the pins' bobweights. */
  mass: string;
  /** Lightest and heaviest pin figure, and their difference. */
  min: string;
  max: string;
  spread: string;
  /**
   * The pins differ by more than the scale resolution: one bobweight built to the mean is off
   * on some pin by more than the scale can show, so check the weights before building it.
   */
  spreadAboveResolution: boolean;
}

/**
 * The bobweight to build: the machinist builds one set of bobweights for the balancer, but
 * matched parts still leave each crankpin's figure a little different. Pins that carry the
 * same number of rods share one figure, the mean of their bobweights; the per-pin figures and
 * their spread come with it, and a flag when the spread is wider than the scale resolution
 * (repeated readings of one part are treated the same way; common practice). Pins with a different
 * number of rods (custom layouts only) make a separate set: their bobweights are never averaged
 * together.
 *
 * @param input - each pin's bobweight and its cylinders, and the scale resolution, in one unit
 * @returns one set per number of rods on a pin, fewest rods first; empty when there is no pin
 * @throws {BalanceInputError} `field: "resolution"` not a positive decimal string;
 *   `"bobweights.<i>.mass"` not a positive decimal string; `"bobweights.<i>.crankpin"` not a
 *   whole number of 1 or more, or (code `duplicate`) a crankpin given twice;
 *   `"bobweights.<i>.cylinders"` (code `empty`) a pin with no cylinder
 *
 * @example
 * bobweightToBuild({
 *   resolution: "0.1",
 *   bobweights: [
 *     { crankpin: 1, cylinders: [1, 2], mass: "1936.0" },
 *     { crankpin: 2, cylinders: [3, 4], mass: "1936.9" },
 *     { crankpin: 3, cylinders: [5, 6], mass: "1936.4" },
 *     { crankpin: 4, cylinders: [7, 8], mass: "1936.5" },
 *   ],
 * });
 * // [{ rodsPerPin: 2, pins: [...], mass: "1936.45", min: "1936", max: "1936.9",
 * //    spread: "0.9", spreadAboveResolution: true }]   (7745.8 ÷ 4; 0.9 > 0.1)
 */
export function bobweightToBuild(input: BobweightToBuildInput): BobweightSet[] {
  const resolution = parseQuantity(input.resolution, "resolution");
  const seen = new Set<number>();
  const byRods = new Map<number, { crankpin: number; mass: Dec }[]>();
  input.bobweights.forEach((pin, i) => {
    const at = `bobweights.${i}`;
    const crankpin = parseInteger(pin.crankpin, `${at}.crankpin`, 1);
    if (seen.has(crankpin)) {
      throw new BalanceInputError(
        `${at}.crankpin`,
        "duplicate",
        `${at}.crankpin: crankpin ${crankpin} is given twice`,
      );
    }
    seen.add(crankpin);
    if (!Array.isArray(pin.cylinders) || pin.cylinders.length === 0) {
      throw new BalanceInputError(
        `${at}.cylinders`,
        "empty",
        `${at}.cylinders: a crankpin carries at least one rod`,
      );
    }
    const mass = parseQuantity(pin.mass, `${at}.mass`);
    const rods = pin.cylinders.length;
    byRods.set(rods, [...(byRods.get(rods) ?? []), { crankpin, mass }]);
  });

  return [...byRods.entries()]
    .sort(([a], [b]) => a - b)
    .map(([rodsPerPin, pins]): BobweightSet => {
      const sorted = [...pins].sort((a, b) => a.crankpin - b.crankpin);
      const masses = sorted.map((p) => p.mass);
      const min = Dec.min(...masses);
      const max = Dec.max(...masses);
      const spread = max.minus(min);
      return {
        rodsPerPin,
        pins: sorted.map((p) => ({ crankpin: p.crankpin, mass: out(p.mass) })),
        mass: out(Dec.sum(...masses).div(masses.length)),
        min: out(min),
        max: out(max),
        spread: out(spread),
        spreadAboveResolution: spread.gt(resolution),
      };
    });
}
