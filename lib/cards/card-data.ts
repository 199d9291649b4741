import type { CardPageSize } from "@/db/cards-schema";
import type { Customer } from "@/db/customers";
import { ROTATING_PARTS, type PartKind, type RotatingPart } from "@/db/schema";
import type { ShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import {
  findLayoutPreset,
  type BalanceWarning,
  type BobweightSet,
  type MatchedKind,
  type PartStatus,
} from "@/lib/balance";
import { showLength } from "@/lib/jobs/lengths";
import type { RotatingRecordInput } from "@/lib/validation/workshop";
import type { Workshop } from "@/lib/workshop/load";
import { figuresOf, type RotatingUnits } from "@/lib/workshop/rotating";

/** Bumped whenever the shape below changes, so old snapshots can still be read. */
export const CARD_DATA_FORMAT = 1;

/** The parts printed per cylinder, in bench order. */
export const CARD_PART_KINDS = [
  "piston",
  "wristPin",
  "retainers",
  "rings",
  "smallEnd",
  "bigEnd",
  "bearing",
] as const satisfies readonly PartKind[];
export type CardPartKind = (typeof CARD_PART_KINDS)[number];

export interface CardPartFigure {
  /** As first weighed (the mean of repeated readings). */
  before: string;
  /** As finished: the weight after machining where re-weighed, else the planned weight. */
  after: string;
  /** True when `after` was weighed, false when it is the planned figure. */
  reweighed: boolean;
  /** Against the target after machining. */
  status: PartStatus;
  /** `before` is a mean of repeated readings: shown one decimal finer. Absent on older cards. */
  beforeComputed?: boolean;
  /** `after` is worked out (a planned weight or a mean): shown one decimal finer. */
  afterComputed?: boolean;
}

export interface CardCylinder {
  number: number;
  crankpin: number;
  parts: Partial<Record<CardPartKind, CardPartFigure>>;
  reciprocating: string;
  rotating: string;
}

export interface CardBobweight {
  crankpin: number;
  cylinders: number[];
  rotating: string;
  reciprocating: string;
  mass: string;
  /** The oil allowance in this bobweight (rods on the pin × per rod). Absent on older cards. */
  oil?: string;
}

export interface CardPlane {
  plane: string;
  /** Permissible residual unbalance, g·mm. */
  allowed: string;
  /** The same as a mass at the balancer radius, g. */
  allowedMass: string | null;
  /** Residual before correction, g·mm, and the balancer reading as typed (the record's unit). */
  before: { residual: string; mass: string } | null;
  /** Final residual, g·mm, the reading as typed (the record's unit), and whether it is within. */
  after: { residual: string; mass: string; pass: boolean } | null;
}

export interface CardRotatingRecord {
  part: RotatingPart;
  recorded: boolean;
  grade: string | null;
  rpm: number | null;
  massKg: string | null;
  radiusMm: string | null;
  /**
   * The units the record was typed in: readings, corrections and the plane's masses in g or oz,
   * the rotor in kg or lb, the radius in mm or in. Absent on older cards: grams and mm.
   */
  units?: RotatingUnits;
  /** The rotor's mass and the balancer radius as typed, in `units`. Absent on older cards. */
  rotorMass?: string | null;
  radius?: string | null;
  planes: CardPlane[];
  /** Pass/fail of the final readings against the grade; null when not read yet. */
  pass: boolean | null;
  /** Each correction's mass as typed (in `units`) and its angle, degrees, when noted. */
  corrections: {
    plane: string;
    method: string;
    where: string;
    mass: string;
    angle?: string | null;
  }[];
  notes: string | null;
  /** What is missing to work the allowance out. */
  missing: string[];
}

/** Everything a balance card shows, stored with the card exactly as it was printed. */
export interface CardData {
  format: typeof CARD_DATA_FORMAT;
  code: string;
  verifyUrl: string;
  revision: number;
  /** The revision this one replaces, if any. */
  supersedes: number | null;
  pageSize: CardPageSize;
  issuedAt: string;
  /** The shop's time zone when issued (the date printed is that day there); absent on older cards: UTC. */
  timeZone?: string;
  issuedBy: { id: number; name: string };
  shop: {
    name: string;
    address: string | null;
    phone: string | null;
    email: string | null;
    logoSha256: string | null;
  };
  customer: { name: string; company: string | null };
  job: {
    id: number;
    number: string;
    engine: string;
    layout: string | null;
    layoutLabel: string | null;
    cylinders: number;
    boreMm: string | null;
    strokeMm: string | null;
    rodLengthMm: string | null;
    /** Bore, stroke and rod length as typed, with their unit ("4.030 in"). Absent on older cards. */
    dimensions?: { bore: string | null; stroke: string | null; rodLength: string | null };
    maxRpm: number | null;
    balanceType: "internal" | "external" | null;
  };
  unit: "g" | "oz";
  resolution: string;
  tolerance: string;
  /** How the tolerance was applied: kind by kind, or whole reciprocating assemblies. */
  matching?: "by-part" | "by-cylinder";
  scaleName: string | null;
  balancerName: string | null;
  /** The kinds of part weighed on this job, in bench order. */
  kinds: CardPartKind[];
  targets: Partial<Record<MatchedKind, string>>;
  cylinders: CardCylinder[];
  bobweightNeeded: boolean;
  balanceFactor: string | null;
  oilAllowance: string;
  /** Per rod; null when the job used a per-crankpin figure. Absent on older cards. */
  oilAllowancePerRod?: string | null;
  bobweights: CardBobweight[];
  /** The figure to build the bobweights to, per number of rods on a pin. Absent on older cards. */
  buildTo?: BobweightSet[];
  rotating: CardRotatingRecord[];
  /** What the balance engine flagged (light parts, spread readings, …). */
  notices: string[];
  /**
   * Issued although parts were outside the band, light, to re-select or confirmed outliers
   * (lib/cards/exceptions.ts): those parts as printed and the machinist's reason. Absent otherwise.
   */
  override?: CardOverride | null;
}

export interface CardOverride {
  parts: string[];
  reason: string;
}

export interface CardDataInput {
  workshop: Workshop;
  customer: Pick<Customer, "name" | "company">;
  settings: Pick<ShopSettings, "shopName" | "address" | "phone" | "email">;
  logoSha256: string | null;
  issuer: Pick<User, "id" | "name">;
  revision: number;
  code: string;
  verifyUrl: string;
  pageSize: CardPageSize;
  issuedAt: string;
  /** The shop's time zone (IANA name) the card's date is stated in. */
  timeZone?: string;
}

/**
 * The card's content from a job whose weigh-in is complete. Figures stay exact decimal strings;
 * the PDF rounds them by the display rule when it prints them (lib/cards/format.ts).
 *
 * @throws Error when the plan is not complete (callers check `plan.complete` first).
 */
export function buildCardData(input: CardDataInput): CardData {
  const { workshop } = input;
  const { job, plan } = workshop;
  const { removal, finished } = plan;
  if (!plan.complete || !removal || !finished) throw new Error("the weigh-in is not complete");

  const reweighed = new Set(
    workshop.weights
      .filter((w) => w.phase === "final" && w.readings.length > 0)
      .map((w) => `${w.cylinder}:${w.kind}`),
  );
  const before = new Map(removal.parts.map((p) => [`${p.cylinder}:${p.kind}`, p]));
  const kinds = CARD_PART_KINDS.filter((k) => finished.parts.some((p) => p.kind === k));

  const cylinders = finished.cylinders.map((c): CardCylinder => {
    const parts: CardCylinder["parts"] = {};
    for (const p of finished.parts) {
      if (p.cylinder !== c.number || !isCardKind(p.kind)) continue;
      const key = `${p.cylinder}:${p.kind}`;
      const first = before.get(key);
      const beforeComputed = (first?.readings?.length ?? 1) > 1;
      parts[p.kind] = {
        before: first?.measured ?? p.measured,
        after: p.measured,
        reweighed: reweighed.has(key),
        status: p.status,
        beforeComputed,
        // Not re-weighed: the planned weight, worked out unless the part was left as weighed.
        afterComputed: reweighed.has(key)
          ? (p.readings?.length ?? 1) > 1
          : beforeComputed || (first !== undefined && first.final !== first.measured),
      };
    }
    return {
      number: c.number,
      crankpin: c.crankpin,
      parts,
      reciprocating: c.reciprocating,
      rotating: c.rotating,
    };
  });

  const preset = job.spec.layout ? findLayoutPreset(job.spec.layout) : undefined;
  return {
    format: CARD_DATA_FORMAT,
    code: input.code,
    verifyUrl: input.verifyUrl,
    revision: input.revision,
    supersedes: input.revision > 1 ? input.revision - 1 : null,
    pageSize: input.pageSize,
    issuedAt: input.issuedAt,
    ...(input.timeZone ? { timeZone: input.timeZone } : {}),
    issuedBy: { id: input.issuer.id, name: input.issuer.name },
    shop: {
      name: input.settings.shopName,
      address: input.settings.address,
      phone: input.settings.phone,
      email: input.settings.email,
      logoSha256: input.logoSha256,
    },
    customer: { name: input.customer.name, company: input.customer.company },
    job: {
      id: job.id,
      number: job.number,
      engine: job.engine,
      layout: job.spec.layout,
      layoutLabel: preset?.label ?? null,
      cylinders: finished.cylinders.length,
      boreMm: job.spec.boreMm,
      strokeMm: job.spec.strokeMm,
      rodLengthMm: job.spec.rodLengthMm,
      dimensions: {
        bore: showLength(job.spec, "bore"),
        stroke: showLength(job.spec, "stroke"),
        rodLength: showLength(job.spec, "rodLength"),
      },
      maxRpm: job.spec.maxRpm,
      balanceType: job.spec.balanceType,
    },
    unit: finished.unit,
    resolution: finished.resolution,
    tolerance: finished.tolerance,
    matching: finished.matching,
    // A name cleared in the settings is saved as ""; the card then says it was not named.
    scaleName: job.spec.scaleName?.trim() || null,
    balancerName: job.spec.balancerName?.trim() || null,
    kinds,
    targets: finished.targets,
    cylinders,
    bobweightNeeded: finished.bobweightNeeded,
    // A layout balanced without bobweights has no factor to print.
    balanceFactor: finished.bobweightNeeded ? finished.balanceFactor : null,
    oilAllowance: finished.oilAllowance,
    oilAllowancePerRod: finished.oilAllowancePerRod,
    bobweights: finished.bobweights.map((b) => ({
      crankpin: b.crankpin,
      cylinders: b.cylinders,
      rotating: b.rotating,
      reciprocating: b.reciprocating,
      mass: b.mass,
      oil: b.oil,
    })),
    buildTo: finished.buildTo,
    rotating: ROTATING_PARTS.map((part) => rotatingRecord(workshop, part)),
    notices: notices(removal.warnings, finished.warnings),
  };
}

function isCardKind(kind: string): kind is CardPartKind {
  return (CARD_PART_KINDS as readonly string[]).includes(kind);
}

/**
 * Light parts as finished (a replaced part no longer counts), everything else as first weighed:
 * the finished set mixes planned and weighed figures, so its rod-total checks would mislead.
 */
function notices(removal: BalanceWarning[], finished: BalanceWarning[]): string[] {
  const kept = [
    ...removal.filter((w) => w.code !== "part-light" && w.code !== "balance-factor-unused"),
    ...finished.filter((w) => w.code === "part-light"),
  ];
  return [...new Set(kept.map((w) => w.message))];
}

function rotatingRecord(workshop: Workshop, part: RotatingPart): CardRotatingRecord {
  const record = workshop.rotating.find((r) => r.part === part);
  if (!record) {
    return {
      part,
      recorded: false,
      grade: null,
      rpm: null,
      massKg: null,
      radiusMm: null,
      planes: [],
      pass: null,
      corrections: [],
      notes: null,
      missing: [],
    };
  }
  const data = record.data as RotatingRecordInput;
  const figures = figuresOf(data);
  const { permissible, before, after, missing } = record.check;
  // The allowance per plane the readings were checked against: the whole U_per for one plane.
  const single = record.check.planes === "one";
  const planes: CardPlane[] = record.check.allowances.map((p) => {
    const b = before?.planes.find((x) => x.plane === p.plane);
    const a = after?.planes.find((x) => x.plane === p.plane);
    const reading = (side: RotatingRecordInput["before"]) =>
      side?.[p.plane as "A" | "B"]?.mass ?? "0";
    return {
      plane: single ? "single" : p.plane,
      allowed: p.uPer,
      allowedMass: p.massAtRadius ?? null,
      before: b ? { residual: b.residual, mass: reading(data.before) } : null,
      after: a ? { residual: a.residual, mass: reading(data.after), pass: a.pass } : null,
    };
  });
  return {
    part,
    recorded: true,
    grade: permissible?.grade ?? data.grade ?? null,
    rpm: data.rpm ?? null,
    massKg: figures.rotorMass?.kg ?? null,
    radiusMm: figures.radius?.mm ?? null,
    units: figures.units,
    rotorMass: figures.rotorMass?.entered ?? null,
    radius: figures.radius?.entered ?? null,
    planes,
    pass: after ? after.pass : null,
    corrections: (data.corrections ?? []).map((c) => ({
      plane: c.plane,
      method: c.method,
      where: c.where,
      mass: c.mass,
      angle: c.angle ?? null,
    })),
    notes: data.notes ?? null,
    missing,
  };
}

/** Reads a stored snapshot back. */
export function parseCardData(json: string): CardData {
  return JSON.parse(json) as CardData;
}
