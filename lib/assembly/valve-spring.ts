import { Dec, out } from "./decimal";
import { AssemblyInputError } from "./errors";
import { parseOptionalQuantity, parseQuantity, requireRecord } from "./parse";

export interface ValveSpringInput {
  /**
   * Load at `installedHeight` as measured on a spring tester or given by the spring maker
   * (lb or N). When given it is used rather than the free-length estimate.
   */
  installedLoad?: string;
  /** Spring rate, load per unit length (lb/in or N/mm), in the units of the loads and lengths. */
  rate: string;
  /** Free length (in or mm); needed when `installedLoad` is not given. */
  freeLength?: string;
  /** Installed height, spring seat to underside of the retainer, without any shim (in or mm). */
  installedHeight: string;
  /** Valve lift at the retainer (in or mm): the cam's lobe lift times the rocker ratio. */
  lift: string;
  /** Solid (coil-bind) height (in or mm), to check the margin at full lift. */
  solidHeight?: string;
  /** Total thickness of shims under the spring (in or mm); default none. */
  shim?: string;
}

export interface ValveSpringResult {
  /** Load on the seat with the valve closed, shim included (lb or N). */
  seatLoad: string;
  /** Load at full lift: seat load + rate × lift (lb or N). */
  openLoad: string;
  /** Spring height at full lift: installed height − shim − lift. */
  openHeight: string;
  /** Height left before the coils touch at full lift: open height − solid height. */
  coilBindMargin?: string;
  /** True when the margin is zero or less: the spring goes solid before full lift. */
  coilBind?: boolean;
}

/**
 * Seat and open loads of a valve spring and its coil-bind margin, by Hooke's law for a linear
 * spring (Hooke's law): seat load = rate × (free length − installed height) when no measured
 * load is given; a shim of thickness t shortens the installed height by t and adds rate × t;
 * open load = seat load + rate × lift. Real springs are not perfectly linear (progressive and
 * beehive springs least of all): check loads on a spring tester and keep to the cam and spring
 * maker's figures; a spring that goes solid can break the valve train.
 *
 * Unit-agnostic: lb, lb/in and in, or N, N/mm and mm, consistently.
 *
 * @param input - rate, installed height, lift, and the installed load or the free length
 * @returns seat and open loads, the height at full lift and, with a solid height, the margin
 * @throws {AssemblyInputError} `rate`, `installedHeight` or `lift` missing or not above zero;
 *   `installedLoad` (`required`) when neither it nor `freeLength` is given; `installedLoad`
 *   negative; `shim` negative or not less than the installed height (`out-of-range`);
 *   `freeLength` not longer than installed height − shim (`out-of-range`: a loose spring);
 *   `lift` not less than installed height − shim (`out-of-range`); `solidHeight` not above
 *   zero or not shorter than the free length (`out-of-range`)
 *
 * @example
 * valveSpring({ installedLoad: "100", rate: "300", installedHeight: "1.800", lift: "0.500", solidHeight: "1.150" });
 * // { seatLoad: "100", openLoad: "250", openHeight: "1.3", coilBindMargin: "0.15", coilBind: false }
 * // (100 + 300 × 0.500 = 250 lb; 1.800 − 0.500 = 1.300 in; 1.300 − 1.150 = 0.150 in)
 */
export function valveSpring(input: ValveSpringInput): ValveSpringResult {
  const raw = requireRecord(input);
  const rate = parseQuantity(raw.rate, { field: "rate", label: "Spring rate" }, "positive");
  const installedHeight = parseQuantity(
    raw.installedHeight,
    { field: "installedHeight", label: "Installed height" },
    "positive",
  );
  const lift = parseQuantity(raw.lift, { field: "lift", label: "Valve lift" }, "positive");
  const shim =
    parseOptionalQuantity(raw.shim, { field: "shim", label: "Shim thickness" }, "non-negative") ??
    new Dec(0);
  const installedLoad = parseOptionalQuantity(
    raw.installedLoad,
    { field: "installedLoad", label: "Load at installed height" },
    "non-negative",
  );
  const freeLength = parseOptionalQuantity(
    raw.freeLength,
    { field: "freeLength", label: "Free length" },
    "positive",
  );
  const solidHeight = parseOptionalQuantity(
    raw.solidHeight,
    { field: "solidHeight", label: "Solid height" },
    "positive",
  );

  if (shim.gte(installedHeight)) {
    throw new AssemblyInputError(
      "shim",
      "out-of-range",
      `Shim thickness (${shim.toString()}) must be less than the installed height (${installedHeight.toString()})`,
    );
  }
  const height = installedHeight.minus(shim);
  if (freeLength !== undefined && freeLength.lte(height)) {
    throw new AssemblyInputError(
      "freeLength",
      "out-of-range",
      `Free length (${freeLength.toString()}) must be longer than the installed height less any shim (${height.toString()}); otherwise the spring is loose on its seat`,
    );
  }
  if (solidHeight !== undefined && freeLength !== undefined && solidHeight.gte(freeLength)) {
    throw new AssemblyInputError(
      "solidHeight",
      "out-of-range",
      `Solid height (${solidHeight.toString()}) must be shorter than the free length (${freeLength.toString()})`,
    );
  }
  if (lift.gte(height)) {
    throw new AssemblyInputError(
      "lift",
      "out-of-range",
      `Valve lift (${lift.toString()}) must be less than the installed height less any shim (${height.toString()})`,
    );
  }

  let seatLoad: Dec;
  if (installedLoad !== undefined) {
    seatLoad = installedLoad.plus(rate.times(shim));
  } else if (freeLength !== undefined) {
    seatLoad = rate.times(freeLength.minus(height));
  } else {
    throw new AssemblyInputError(
      "installedLoad",
      "required",
      "Load at installed height is required, or give the spring's free length to estimate it",
    );
  }
  const openHeight = height.minus(lift);
  const result: ValveSpringResult = {
    seatLoad: out(seatLoad),
    openLoad: out(seatLoad.plus(rate.times(lift))),
    openHeight: out(openHeight),
  };
  if (solidHeight !== undefined) {
    const margin = openHeight.minus(solidHeight);
    result.coilBindMargin = out(margin);
    result.coilBind = margin.lte(0);
  }
  return result;
}
