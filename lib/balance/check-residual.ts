import { Dec, ONE_HUNDRED, out } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseOptionalQuantity, parseQuantity, requireAtMost, requireRecord } from "./parse";

export interface ResidualReading {
  /** Correction plane name, as in the allowance ("A", "B"). */
  plane: string;
  /** Residual mass the balancer reads, g (0 allowed). */
  mass: string;
  /** Radius of that reading, mm. */
  radius: string;
  /** Angle of the heavy spot, degrees 0–360; carried through. */
  angle?: string;
}

export interface CheckResidualInput {
  /** A `permissibleUnbalance` result, or any list of planes with their U_per in g·mm. */
  permissible: { planes: readonly { plane: string; uPer: string }[] };
  /** One reading for every plane of `permissible`. */
  readings: readonly ResidualReading[];
}

export interface PlaneCheck {
  plane: string;
  /** mass × radius, g·mm. */
  residual: string;
  /** U_per for the plane, g·mm. */
  allowed: string;
  pass: boolean;
  /** allowed − residual, g·mm (negative on a fail). */
  margin: string;
  /** margin as a percentage of allowed. */
  marginPercent: string;
  angle?: string;
}

export interface ResidualCheck {
  /** True when every plane passes. */
  pass: boolean;
  /** In the order of `permissible.planes`. */
  planes: PlaneCheck[];
}

/**
 * Compares balancer readings with the permissible residual unbalance (ISO 21940-11): a reading
 * of m grams at radius r is an unbalance of m·r g·mm; the plane passes when that is at most
 * its U_per. For a single-plane check, pass one plane.
 *
 * @param input - the allowance per plane (g·mm) and one reading per plane (g, mm, degrees)
 * @returns per plane the residual, allowance, margin and pass/fail, and an overall pass
 * @throws {BalanceInputError} `permissible.planes` (code `empty`) with no planes,
 *   `permissible.planes.<i>.uPer` not positive, `readings.<i>.plane` unknown (`unknown-plane`) or
 *   repeated (`duplicate`), `readings` missing a plane (`missing-plane`), `readings.<i>.mass`
 *   negative, `readings.<i>.radius` not positive, `readings.<i>.angle` outside 0–360
 *
 * @example
 * checkResidual({
 *   permissible: { planes: [{ plane: "A", uPer: "100" }, { plane: "B", uPer: "100" }] },
 *   readings: [{ plane: "A", mass: "0.8", radius: "100" }, { plane: "B", mass: "1.1", radius: "100" }],
 * });
 * // { pass: false, planes: [
 * //   { plane: "A", residual: "80", allowed: "100", pass: true, margin: "20", marginPercent: "20" },
 * //   { plane: "B", residual: "110", allowed: "100", pass: false, margin: "-10", marginPercent: "-10" } ] }
 */
export function checkResidual(input: CheckResidualInput): ResidualCheck {
  const root = requireRecord(input, "input");
  const permissible = requireRecord(root.permissible, "permissible");
  const planes = permissible.planes;
  if (!Array.isArray(planes) || planes.length === 0) {
    throw new BalanceInputError(
      "permissible.planes",
      "empty",
      "permissible.planes needs at least one plane",
    );
  }
  const allowed = new Map<string, Dec>();
  planes.forEach((item: unknown, i) => {
    const plane = requireRecord(item, `permissible.planes.${i}`);
    if (typeof plane.plane !== "string" || plane.plane === "") {
      throw new BalanceInputError(
        `permissible.planes.${i}.plane`,
        "required",
        `permissible.planes.${i}.plane: each plane needs a name`,
      );
    }
    if (allowed.has(plane.plane)) {
      throw new BalanceInputError(
        `permissible.planes.${i}.plane`,
        "duplicate",
        `permissible.planes.${i}.plane: plane ${plane.plane} is given twice`,
      );
    }
    allowed.set(plane.plane, parseQuantity(plane.uPer, `permissible.planes.${i}.uPer`));
  });

  if (!Array.isArray(root.readings))
    throw new BalanceInputError("readings", "required", "readings must be a list");
  const readings = new Map<string, { residual: Dec; angle?: Dec }>();
  root.readings.forEach((item: unknown, i) => {
    const reading = requireRecord(item, `readings.${i}`);
    const name = reading.plane;
    if (typeof name !== "string" || !allowed.has(name)) {
      throw new BalanceInputError(
        `readings.${i}.plane`,
        "unknown-plane",
        `readings.${i}.plane ${JSON.stringify(name)} is not a plane of the allowance`,
      );
    }
    if (readings.has(name))
      throw new BalanceInputError(
        `readings.${i}.plane`,
        "duplicate",
        `readings.${i}.plane: plane ${name} is read twice`,
      );
    const mass = parseQuantity(reading.mass, `readings.${i}.mass`, "non-negative");
    const radius = parseQuantity(reading.radius, `readings.${i}.radius`);
    const angle = parseOptionalQuantity(reading.angle, `readings.${i}.angle`, "non-negative");
    if (angle !== undefined)
      requireAtMost(angle, new Dec(360), `readings.${i}.angle`, "an angle from 0 to 360 degrees");
    readings.set(
      name,
      angle === undefined
        ? { residual: mass.times(radius) }
        : { residual: mass.times(radius), angle },
    );
  });

  const results = [...allowed].map(([plane, limit]): PlaneCheck => {
    const reading = readings.get(plane);
    if (reading === undefined)
      throw new BalanceInputError(
        "readings",
        "missing-plane",
        `readings: plane ${plane} has no reading`,
      );
    const margin = limit.minus(reading.residual);
    const check: PlaneCheck = {
      plane,
      residual: out(reading.residual),
      allowed: out(limit),
      pass: reading.residual.lte(limit),
      margin: out(margin),
      marginPercent: out(margin.div(limit).times(ONE_HUNDRED)),
    };
    if (reading.angle !== undefined) check.angle = out(reading.angle);
    return check;
  });
  return { pass: results.every((r) => r.pass), planes: results };
}
