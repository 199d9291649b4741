import Decimal from "decimal.js";
import {
  checkResidual,
  convertLength,
  convertMass,
  isBalanceInputError,
  permissibleUnbalance,
  type PermissibleUnbalance,
  type ResidualCheck,
} from "@/lib/balance";
import type { RotatingPart } from "@/db/schema";
import type { RotatingRecord } from "@/db/weights";
import type {
  CorrectionPlanes,
  RotatingLengthUnit,
  RotatingMassUnit,
  RotatingRecordInput,
} from "@/lib/validation/workshop";

type Plane = "A" | "B";

/** What one correction plane may keep: the allowance the readings are checked against. */
export interface PlaneAllowanceAtRadius {
  plane: Plane;
  /** Permissible residual unbalance in this plane, g·mm. */
  uPer: string;
  /** The same as grams at the balancer radius, g. */
  massAtRadius: string;
  /** Fraction of the whole U_per given to this plane ("1" for a single plane). */
  share: string;
  /** True when the 30–70 % limits of ISO 21940-11 §7.2 held the share. */
  clamped: boolean;
}

/** The units a record was typed in: grams and mm unless it says otherwise. */
export interface RotatingUnits {
  /** Readings and corrections; the rotor's mass is then in kg (g) or lb (oz). */
  mass: RotatingMassUnit;
  /** Balancer radius and plane distances. */
  length: RotatingLengthUnit;
}

/** Kilograms in one pound, exact (1 lb = 453.59237 g, NIST SP 811 App. B.8). */
export const KILOGRAMS_PER_POUND = "0.45359237";

/** The rotor's mass unit that goes with a reading unit: kg with grams, lb with ounces. */
export function rotorMassUnit(unit: RotatingMassUnit): "kg" | "lb" {
  return unit === "oz" ? "lb" : "kg";
}

/** A record's units: what it says it was typed in, else grams and millimetres (older records). */
export function unitsOf(data: RotatingRecordInput): RotatingUnits {
  return { mass: data.massUnit ?? "g", length: data.lengthUnit ?? "mm" };
}

/** A record's figures as typed, each with the engine's (g, mm, kg) beside it. */
export interface RotatingFigures {
  units: RotatingUnits;
  /** The rotor's mass as typed (kg or lb) and in kg. */
  rotorMass: { entered: string; kg: string } | null;
  /** The balancer radius as typed and in mm. */
  radius: { entered: string; mm: string } | null;
  /** Plane distances from the centre of mass as typed and in mm. */
  planeDistances: { A: { entered: string; mm: string }; B: { entered: string; mm: string } } | null;
}

/** A reading or correction typed in the record's mass unit, in grams (exact for ounces). */
export function gramsOf(mass: string, unit: RotatingMassUnit): string {
  return unit === "oz" ? convertMass(mass, "oz", "g") : mass;
}

/** A length typed in the record's length unit, in mm (1 in = 25.4 mm exactly). */
export function millimetresOf(length: string, unit: RotatingLengthUnit): string {
  return unit === "in" ? convertLength(length, "in", "mm") : length;
}

/** A rotor mass typed in kg or lb (with ounce readings), in kg (1 lb = 0.45359237 kg exactly). */
export function kilogramsOf(mass: string, unit: RotatingMassUnit): string {
  return unit === "oz" ? new Decimal(mass).times(KILOGRAMS_PER_POUND).toFixed() : mass;
}

/**
 * A record's rotor mass, radius and plane distances as typed, converted exactly for the engine.
 * Older records keep kg and mm under their own names (massKg, radiusMm, planeDistanceAMm…),
 * which hold whatever the record's units.
 */
export function figuresOf(data: RotatingRecordInput): RotatingFigures {
  const units = unitsOf(data);
  const length = (typed: string | null | undefined, mm: string | null | undefined) =>
    typed
      ? { entered: typed, mm: millimetresOf(typed, units.length) }
      : mm
        ? { entered: units.length === "mm" ? mm : convertLength(mm, "mm", "in"), mm }
        : null;
  const rotorMass = data.rotorMass
    ? { entered: data.rotorMass, kg: kilogramsOf(data.rotorMass, units.mass) }
    : data.massKg
      ? {
          entered:
            units.mass === "oz"
              ? new Decimal(data.massKg).div(KILOGRAMS_PER_POUND).toSignificantDigits(10).toFixed()
              : data.massKg,
          kg: data.massKg,
        }
      : null;
  const a = length(data.planeDistanceA, data.planeDistanceAMm);
  const b = length(data.planeDistanceB, data.planeDistanceBMm);
  return {
    units,
    rotorMass,
    radius: length(data.radius, data.radiusMm),
    planeDistances: a && b ? { A: a, B: b } : null,
  };
}

/**
 * An unbalance in g·mm (or a specific unbalance in g·mm/kg) in the record's units: g·mm, g·in,
 * oz·mm or oz·in (g·mm/kg or oz·in/lb). Exact factors (NIST SP 811 App. B.8); the sign kept.
 */
export function unbalanceIn(gmm: string, units: RotatingUnits, perMass = false): string {
  const negative = gmm.trim().startsWith("-");
  const size = negative ? gmm.trim().slice(1) : gmm.trim();
  let out = convertLength(convertMass(size, "g", units.mass), "mm", units.length);
  if (perMass && units.mass === "oz") out = new Decimal(out).times(KILOGRAMS_PER_POUND).toFixed();
  return negative && !/^0(\.0*)?$/.test(out) ? `-${out}` : out;
}

/** The symbol of an unbalance in a record's units: "g·mm", "oz·in"… */
export function unbalanceUnit(units: RotatingUnits): string {
  return `${units.mass}·${units.length}`;
}

export interface RotatingCheck {
  /** The units the record was typed in (figures below stay g, mm, kg). */
  units: RotatingUnits;
  /** One correction plane (the whole U_per there) or two (shared per ISO 21940-11 §7.2). */
  planes: CorrectionPlanes;
  permissible: PermissibleUnbalance | null;
  /** The allowance per plane actually used: one entry for one plane, two for two. */
  allowances: PlaneAllowanceAtRadius[];
  /** Balancer radius the readings are taken at, mm. */
  radiusMm: string | null;
  before: ResidualCheck | null;
  after: ResidualCheck | null;
  /** Why a figure could not be worked out (a missing speed, say). */
  missing: string[];
}

/**
 * How many planes a record is balanced in: as the machinist chose; otherwise two for a
 * crankshaft, and for a flywheel, clutch cover or damper two only when a plane B reading
 * was kept (records saved before the choice existed), else one.
 */
export function planesOf(part: RotatingPart, data: RotatingRecordInput): CorrectionPlanes {
  if (data.planes) return data.planes;
  if (part === "crankshaft") return "two";
  return data.before?.B || data.after?.B ? "two" : "one";
}

/**
 * Permissible residual per plane for one rotating part (ISO 21940-11) and pass/fail of its
 * readings. In one plane the whole U_per is allowed there; in two it is shared by distance or
 * half each (`permissibleUnbalance`). A reading of m grams at the balancer radius r is the
 * unbalance m·r g·mm.
 */
export function checkRotatingRecord(record: RotatingRecord): RotatingCheck {
  const data = record.data as RotatingRecordInput;
  const planes = planesOf(record.part, data);
  const planeNames: Plane[] = planes === "one" ? ["A"] : ["A", "B"];
  const units = unitsOf(data);
  const empty = { units, planes, permissible: null, allowances: [], before: null, after: null };
  let figures: RotatingFigures;
  try {
    figures = figuresOf(data);
  } catch (error) {
    if (isBalanceInputError(error)) return { ...empty, radiusMm: null, missing: [error.message] };
    throw error;
  }
  const missing = [
    !figures.rotorMass && "mass",
    !data.rpm && "service speed",
    !data.grade && "balance grade",
    !figures.radius && "balancer radius",
  ].filter((m): m is string => Boolean(m));
  if (missing.length > 0) return { ...empty, radiusMm: figures.radius?.mm ?? null, missing };
  const radius = figures.radius!.mm;
  try {
    const permissible = permissibleUnbalance({
      grade: data.grade!,
      rotorMassKg: figures.rotorMass!.kg,
      rpm: String(data.rpm),
      correctionRadius: radius,
      ...(planes === "two" && figures.planeDistances
        ? {
            planes: {
              distanceA: figures.planeDistances.A.mm,
              distanceB: figures.planeDistances.B.mm,
            },
          }
        : {}),
    });
    const allowances: PlaneAllowanceAtRadius[] =
      planes === "one"
        ? [
            {
              plane: "A",
              uPer: permissible.uPer,
              massAtRadius: permissible.massAtRadius!,
              share: "1",
              clamped: false,
            },
          ]
        : permissible.planes.map((p) => ({
            plane: p.plane,
            uPer: p.uPer,
            massAtRadius: p.massAtRadius!,
            share: p.share,
            clamped: p.clamped,
          }));
    const check = (side: RotatingRecordInput["before"]): ResidualCheck | null => {
      const readings = planeNames.map((plane) => side?.[plane]);
      if (readings.some((r) => !r)) return null;
      return checkResidual({
        permissible: { planes: allowances },
        readings: planeNames.map((plane, i) => ({
          plane,
          // Typed in ounces: converted here, exactly, from the figure as typed.
          mass: gramsOf(readings[i]!.mass, units.mass),
          radius,
          ...(readings[i]!.angle ? { angle: readings[i]!.angle } : {}),
        })),
      });
    };
    return {
      units,
      planes,
      permissible,
      allowances,
      radiusMm: radius,
      before: check(data.before),
      after: check(data.after),
      missing: [],
    };
  } catch (error) {
    if (isBalanceInputError(error)) return { ...empty, radiusMm: radius, missing: [error.message] };
    throw error;
  }
}
