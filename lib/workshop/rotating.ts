import {
  checkResidual,
  isBalanceInputError,
  permissibleUnbalance,
  type PermissibleUnbalance,
  type ResidualCheck,
} from "@/lib/balance";
import type { RotatingRecord } from "@/db/weights";
import type { RotatingRecordInput } from "@/lib/validation/workshop";

export interface RotatingCheck {
  permissible: PermissibleUnbalance | null;
  before: ResidualCheck | null;
  after: ResidualCheck | null;
  /** Why a figure could not be worked out (a missing speed, say). */
  missing: string[];
}

/** Permissible residual per plane for one rotating part and pass/fail of its readings. */
export function checkRotatingRecord(record: RotatingRecord): RotatingCheck {
  const data = record.data as RotatingRecordInput;
  const missing = [
    !data.massKg && "mass",
    !data.rpm && "service speed",
    !data.grade && "balance grade",
    !data.radiusMm && "balancer radius",
  ].filter((m): m is string => Boolean(m));
  if (missing.length > 0) return { permissible: null, before: null, after: null, missing };
  try {
    const permissible = permissibleUnbalance({
      grade: data.grade!,
      rotorMassKg: data.massKg!,
      rpm: String(data.rpm),
      correctionRadius: data.radiusMm!,
      ...(data.planeDistanceAMm && data.planeDistanceBMm
        ? { planes: { distanceA: data.planeDistanceAMm, distanceB: data.planeDistanceBMm } }
        : {}),
    });
    const check = (side: RotatingRecordInput["before"]) => {
      if (!side?.A || !side.B) return null;
      return checkResidual({
        permissible,
        readings: (["A", "B"] as const).map((plane) => ({
          plane,
          mass: side[plane]!.mass,
          radius: data.radiusMm!,
          ...(side[plane]!.angle ? { angle: side[plane]!.angle } : {}),
        })),
      });
    };
    return { permissible, before: check(data.before), after: check(data.after), missing: [] };
  } catch (error) {
    if (isBalanceInputError(error))
      return { permissible: null, before: null, after: null, missing: [error.message] };
    throw error;
  }
}
