import { BalanceInputError } from "./errors";
import { PI, out } from "./decimal";
import { parseQuantity } from "./parse";

/** Millimetres per metre. */
const MM_PER_M = 1000;
/** Grams per kilogram. */
const G_PER_KG = 1000;

export interface ReciprocatingLoadsInput {
  /** Stroke, mm. */
  stroke: string;
  /** Connecting rod length, centre to centre, mm; more than half the stroke. */
  rodLength: string;
  /** Engine speed, rpm. */
  rpm: string;
  /** Reciprocating mass of one cylinder, g. */
  reciprocatingMass: string;
}

export interface ReciprocatingLoads {
  /** 2·stroke·n/60, m/s. */
  meanPistonSpeed: string;
  /** r = stroke/2, mm. */
  crankRadius: string;
  /** λ = r/l. */
  lambda: string;
  /** ω = 2πn/60, rad/s. */
  angularSpeed: string;
  /** Piston acceleration at top dead centre, r ω² (1 + λ), m/s². */
  peakAcceleration: string;
  /** The acceleration uses the two-term series a ≈ r ω² (cos θ + λ cos 2θ). */
  form: "two-term";
  /** Primary force amplitude m r ω², N. */
  primaryForce: string;
  /** Secondary force amplitude λ m r ω², N. */
  secondaryForce: string;
}

/**
 * Piston speed and reciprocating inertia loads, Heywood, Internal Combustion Engine
 * Fundamentals (1988), ch. 2: mean piston speed S̄p = 2·L·N; with r = L/2 and λ = r/l the
 * acceleration is a ≈ r ω² (cos θ + λ cos 2θ) (two-term form), largest at θ = 0:
 * r ω² (1 + λ); primary force amplitude m r ω², secondary λ m r ω².
 *
 * @param input - stroke and rod length (mm), speed (rpm), reciprocating mass (g)
 * @returns speed (m/s), acceleration (m/s²), forces (N), λ and ω
 * @throws {BalanceInputError} `stroke`, `rodLength`, `rpm`, `reciprocatingMass` when not positive
 *   decimal strings; `rodLength` (code `out-of-range`) when not longer than the crank radius
 *
 * @example
 * const loads = reciprocatingLoads({ stroke: "86", rodLength: "143", rpm: "6000", reciprocatingMass: "600" });
 * loads.meanPistonSpeed; // "17.2"  m/s
 * loads.lambda; // "0.300699300699..."
 * loads.primaryForce; // "10185.4..."  N  (0.6 kg × 0.043 m × 628.3² s⁻²)
 */
export function reciprocatingLoads(input: ReciprocatingLoadsInput): ReciprocatingLoads {
  const stroke = parseQuantity(input.stroke, "stroke");
  const rod = parseQuantity(input.rodLength, "rodLength");
  const rpm = parseQuantity(input.rpm, "rpm");
  const mass = parseQuantity(input.reciprocatingMass, "reciprocatingMass").div(G_PER_KG);
  const crank = stroke.div(2);
  if (rod.lte(crank)) {
    throw new BalanceInputError(
      "rodLength",
      "out-of-range",
      "rodLength must be longer than half the stroke",
    );
  }
  const lambda = crank.div(rod);
  const omega = PI.times(2).times(rpm).div(60);
  const rOmega2 = crank.div(MM_PER_M).times(omega.pow(2));
  const primary = mass.times(rOmega2);
  return {
    meanPistonSpeed: out(stroke.div(MM_PER_M).times(2).times(rpm).div(60)),
    crankRadius: out(crank),
    lambda: out(lambda),
    angularSpeed: out(omega),
    peakAcceleration: out(rOmega2.times(lambda.plus(1))),
    form: "two-term",
    primaryForce: out(primary),
    secondaryForce: out(primary.times(lambda)),
  };
}
