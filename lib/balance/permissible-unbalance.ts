import { Dec, PI, out } from "./decimal";
import { BalanceInputError } from "./errors";
import { parseOptionalQuantity, parseQuantity, requireRecord } from "./parse";

/** Balance grades of ISO 21940-11:2016 (formerly ISO 1940-1), G in mm/s, coarsest first. */
export const BALANCE_GRADES = [
  "4000",
  "1600",
  "630",
  "250",
  "100",
  "40",
  "16",
  "6.3",
  "2.5",
  "1",
  "0.4",
] as const;
export type BalanceGrade = (typeof BALANCE_GRADES)[number];

/** Least share of U_per either correction plane may get: 30 % (ISO 21940-11 §7.2). */
export const PLANE_SHARE_MIN = "0.3";
/** Greatest share of U_per either correction plane may get: 70 % (ISO 21940-11 §7.2). */
export const PLANE_SHARE_MAX = "0.7";

/** Grams per kilogram; e_per in mm becomes g·mm/kg. */
const G_PER_KG = 1000;
const SHARE_MIN = new Dec(PLANE_SHARE_MIN);
const SHARE_MAX = new Dec(PLANE_SHARE_MAX);
const GRADE_PATTERN = /^G\s?/i;

export interface PermissibleUnbalanceInput {
  /** A grade from {@link BALANCE_GRADES}: "6.3", also "G 6.3" or "G6.3". */
  grade: string;
  /** Rotor mass, kg. */
  rotorMassKg: string;
  /** Maximum service speed, rpm. */
  rpm: string;
  /** Distances from the centre of mass to correction planes A and B, mm; half each when omitted. */
  planes?: { distanceA: string; distanceB: string };
  /** Radius at which corrections are read or made, mm; gives the allowance as a mass. */
  correctionRadius?: string;
}

export interface PlaneAllowance {
  plane: "A" | "B";
  /** Fraction of U_per given to the plane, after the 30–70 % limits. */
  share: string;
  /** Permissible residual unbalance in this plane, g·mm. */
  uPer: string;
  /** True when the distance rule gave a share outside 30–70 % and it was limited. */
  clamped: boolean;
  /** uPer ÷ correctionRadius, g; present when a radius was given. */
  massAtRadius?: string;
}

export interface PermissibleUnbalance {
  grade: BalanceGrade;
  /** Ω = 2πn/60, rad/s. */
  angularSpeed: string;
  /** Permissible specific unbalance e_per = G/Ω, g·mm/kg (numerically µm). */
  ePer: string;
  /** Permissible residual unbalance of the whole rotor U_per = e_per · m, g·mm. */
  uPer: string;
  /** "half-each" (symmetric rotor simplification) or "by-distance" (ISO 21940-11 §7.2). */
  allocation: "half-each" | "by-distance";
  planes: [PlaneAllowance, PlaneAllowance];
  /** True when either plane's share was limited to 30–70 %. */
  clamped: boolean;
  /** Echo of the radius, mm. */
  correctionRadius?: string;
  /** U_per ÷ correctionRadius, g; present when a radius was given. */
  massAtRadius?: string;
}

function parseGrade(value: unknown): BalanceGrade {
  if (typeof value === "string") {
    const text = value.trim().replace(GRADE_PATTERN, "");
    const grade = /^\d+(\.\d+)?$/.test(text)
      ? BALANCE_GRADES.find((g) => new Dec(g).eq(text))
      : undefined;
    if (grade !== undefined) return grade;
  }
  throw new BalanceInputError(
    "grade",
    "unknown-grade",
    `grade must be one of the ISO 21940-11 grades (G ${BALANCE_GRADES.join(", G ")}), not ${JSON.stringify(value)}`,
  );
}

/**
 * Permissible residual unbalance for a balance grade, ISO 21940-11:2016: G = e_per · Ω with
 * Ω = 2πn/60, so e_per = G/Ω and U_per = e_per · m. Computed from π itself rather than the
 * rounded 9549.3 constant (U_per [g·mm] ≈ 9549.3 · G · m / n).
 *
 * Planes: U_A = U_per · L_B/L and U_B = U_per · L_A/L with L_A, L_B the distances from the
 * centre of mass, each share limited to 30–70 % (ISO 21940-11 §7.2; Bloch & Geitner, ch. 6);
 * without distances, half to each plane (handbook simplification for a symmetric rotor).
 *
 * The grades describe whole crankshaft drives; performance shops usually aim much tighter
 * (G 2.5 or better is common practice).
 *
 * @param input - grade, rotor mass (kg), service speed (rpm), optional plane distances and
 *   correction radius (mm)
 * @returns e_per (g·mm/kg), U_per (g·mm), per-plane allowances and masses at the radius (g)
 * @throws {BalanceInputError} `grade` (code `unknown-grade`); `rotorMassKg`, `rpm`,
 *   `planes.distanceA`, `planes.distanceB`, `correctionRadius` when not a positive decimal string
 *
 * @example
 * const p = permissibleUnbalance({ grade: "G 6.3", rotorMassKg: "10", rpm: "3000", correctionRadius: "100" });
 * p.ePer; // "20.0535228..."  g·mm/kg (check value of the standard, ≈ 20.05)
 * p.uPer; // "200.535228..."  g·mm for the 10 kg rotor
 * p.planes[0].uPer; // "100.267614..."  g·mm, half each
 * p.planes[0].massAtRadius; // "1.00267614..."  g at 100 mm
 */
export function permissibleUnbalance(input: PermissibleUnbalanceInput): PermissibleUnbalance {
  const root = requireRecord(input, "input");
  const grade = parseGrade(root.grade);
  const mass = parseQuantity(root.rotorMassKg, "rotorMassKg");
  const rpm = parseQuantity(root.rpm, "rpm");
  const radius = parseOptionalQuantity(root.correctionRadius, "correctionRadius");

  const omega = PI.times(2).times(rpm).div(60);
  const ePer = new Dec(grade).div(omega).times(G_PER_KG);
  const uPer = ePer.times(mass);

  let allocation: PermissibleUnbalance["allocation"] = "half-each";
  let shareA = new Dec("0.5");
  let clampedA = false;
  let clampedB = false;
  if (root.planes !== undefined) {
    const planes = requireRecord(root.planes, "planes");
    const a = parseQuantity(planes.distanceA, "planes.distanceA");
    const b = parseQuantity(planes.distanceB, "planes.distanceB");
    allocation = "by-distance";
    const rawA = b.div(a.plus(b));
    shareA = Dec.min(SHARE_MAX, Dec.max(SHARE_MIN, rawA));
    // The shares add up to one, so when A is outside 30–70 % so is B.
    clampedA = clampedB = !shareA.eq(rawA);
  }
  const shareB = new Dec(1).minus(shareA);

  const plane = (name: "A" | "B", share: Dec, clamped: boolean): PlaneAllowance => {
    const allowed = uPer.times(share);
    const result: PlaneAllowance = { plane: name, share: out(share), uPer: out(allowed), clamped };
    if (radius !== undefined) result.massAtRadius = out(allowed.div(radius));
    return result;
  };
  const result: PermissibleUnbalance = {
    grade,
    angularSpeed: out(omega),
    ePer: out(ePer),
    uPer: out(uPer),
    allocation,
    planes: [plane("A", shareA, clampedA), plane("B", shareB, clampedB)],
    clamped: clampedA || clampedB,
  };
  if (radius !== undefined) {
    result.correctionRadius = out(radius);
    result.massAtRadius = out(uPer.div(radius));
  }
  return result;
}
