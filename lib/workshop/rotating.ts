import {
  checkResidual,
  isBalanceInputError,
  permissibleUnbalance,
  type PermissibleUnbalance,
  type ResidualCheck,
} from "@/lib/balance";
import type { RotatingPart } from "@/db/schema";
import type { RotatingRecord } from "@/db/weights";
import type { CorrectionPlanes, RotatingRecordInput } from "@/lib/validation/workshop";

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

export interface RotatingCheck {
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
  const empty = { planes, permissible: null, allowances: [], before: null, after: null };
  const missing = [
    !data.massKg && "mass",
    !data.rpm && "service speed",
    !data.grade && "balance grade",
    !data.radiusMm && "balancer radius",
  ].filter((m): m is string => Boolean(m));
  if (missing.length > 0) return { ...empty, radiusMm: data.radiusMm ?? null, missing };
  const radius = data.radiusMm!;
  try {
    const permissible = permissibleUnbalance({
      grade: data.grade!,
      rotorMassKg: data.massKg!,
      rpm: String(data.rpm),
      correctionRadius: radius,
      ...(planes === "two" && data.planeDistanceAMm && data.planeDistanceBMm
        ? { planes: { distanceA: data.planeDistanceAMm, distanceB: data.planeDistanceBMm } }
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
          mass: readings[i]!.mass,
          radius,
          ...(readings[i]!.angle ? { angle: readings[i]!.angle } : {}),
        })),
      });
    };
    return {
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
