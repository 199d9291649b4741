import Decimal from "decimal.js";
import {
  bearingClearance,
  type BearingClearanceResult,
  camCorrection,
  type CamCorrectionResult,
  camFromCard,
  type CamCardResult,
  compressionRatio,
  type CompressionRatioResult,
  intakeCentreline,
  type IntakeCentrelineResult,
  isAssemblyInputError,
  ringEndGap,
  type RingEndGapResult,
  trueTdc,
  type TrueTdcResult,
  valveSpring,
  type ValveSpringResult,
} from "@/lib/assembly";
import type { BuildRecordData, RingPosition } from "./schemas";
import type { BuildSettings } from "./settings-schema";

/** A computation that could not be done, with the input it needs, in the builder's words. */
export interface Refusal {
  field: string;
  message: string;
}

type Outcome<T> = { ok: true; value: T } | { ok: false; refusal: Refusal };

function attempt<T>(work: () => T): Outcome<T> {
  try {
    return { ok: true, value: work() };
  } catch (error) {
    if (isAssemblyInputError(error)) {
      return { ok: false, refusal: { field: error.field, message: error.message } };
    }
    throw error;
  }
}

const MM_PER_IN = new Decimal("25.4");

/** A shop figure kept in `from` given in the record's unit `to` (1 in = 25.4 mm, NIST SP 811). */
export function inRecordUnit(value: string | null, from: "in" | "mm", to: "in" | "mm") {
  if (value === null || from === to) return value;
  const v = new Decimal(value);
  return (from === "in" ? v.times(MM_PER_IN) : v.div(MM_PER_IN)).toString();
}

export interface RingRowResult {
  cylinder: number;
  ring: RingPosition;
  /** The gap as it is now: the last reading. */
  measured: string | null;
  factor: string | null;
  result: Outcome<RingEndGapResult> | null;
}

export interface CamCheckResult {
  centreline: Outcome<IntakeCentrelineResult> | null;
  correction: Outcome<CamCorrectionResult> | null;
  final: boolean;
}

export interface SpringRowResult {
  cylinder: number;
  valve: "intake" | "exhaust";
  result: Outcome<ValveSpringResult> | null;
  /** What is outside the window, in words; empty when everything is inside it. */
  flags: string[];
}

export interface ClearanceRowResult {
  kind: "main" | "rod";
  journal: number;
  result: Outcome<BearingClearanceResult> | null;
  /** The window the status was judged against, and where it came from. */
  window: { min: string | null; max: string | null; from: "engine" | "shop" | null };
}

export interface DeckRowResult {
  cylinder: number;
  result: Outcome<CompressionRatioResult> | null;
  /** Piston top to head at TDC: deck clearance + gasket thickness. */
  quench: string | null;
}

export interface BuildRecordResults {
  rings: RingRowResult[];
  tdc: Outcome<TrueTdcResult> | null;
  card: Outcome<CamCardResult> | null;
  /** The intake centreline to install at: the one given, or the card's. */
  installCentreline: string | null;
  cam: CamCheckResult[];
  springs: SpringRowResult[];
  clearances: ClearanceRowResult[];
  deck: DeckRowResult[];
}

const filled = (...values: (string | null | undefined)[]) =>
  values.every((v) => v !== null && v !== undefined && v !== "");

/** The factor for a ring: the one in the engine's figures for this job. */
function factorFor(record: BuildRecordData, ring: RingPosition): string | null {
  return record.specs.ringFactors[ring];
}

/**
 * Works out everything the build record shows, from the record and the shop's settings, with
 * lib/assembly: each ring's target gap and what to file (factor × bore), the pointer
 * correction from the two piston-stop readings, each cam check's intake centreline against the
 * card and the move to make, each spring's seat and open loads and coil-bind margin against the
 * window, each journal's clearance, taper and out-of-round, and each cylinder's compression ratio.
 * A row that cannot be worked out carries the refusal (which input, in words), never a guess.
 * The same function serves the screen and the server's checks.
 *
 * @example
 * evaluateBuildRecord(record, settings).rings[0].result
 * // { ok: true, value: { target: "0.018135", fileOff: "0.003135", status: "tight" } }
 * // for bore 4.030, factor 0.0045 and a gap of 0.015 (0.0045 × 4.030 = 0.018135)
 */
export function evaluateBuildRecord(
  record: BuildRecordData,
  settings: BuildSettings,
): BuildRecordResults {
  const specs = record.specs;
  const unit = specs.lengthUnit;

  const rings = record.rings.rows.map((row): RingRowResult => {
    const measured = row.readings.at(-1) ?? null;
    const factor = factorFor(record, row.ring);
    const result =
      specs.bore && factor
        ? attempt(() =>
            ringEndGap({ bore: specs.bore!, factor, ...(measured ? { measured } : {}) }),
          )
        : null;
    return { cylinder: row.cylinder, ring: row.ring, measured, factor, result };
  });

  const tdc = filled(record.tdc.firstStop, record.tdc.secondStop)
    ? attempt(() =>
        trueTdc({ firstStop: record.tdc.firstStop!, secondStop: record.tdc.secondStop! }),
      )
    : null;

  const c = specs.cam;
  const card = filled(c.intakeOpenBtdc, c.intakeCloseAbdc, c.exhaustOpenBbdc, c.exhaustCloseAtdc)
    ? attempt(() =>
        camFromCard({
          intakeOpenBtdc: c.intakeOpenBtdc!,
          intakeCloseAbdc: c.intakeCloseAbdc!,
          exhaustOpenBbdc: c.exhaustOpenBbdc!,
          exhaustCloseAtdc: c.exhaustCloseAtdc!,
        }),
      )
    : null;
  const installCentreline = c.installCentreline ?? (card?.ok ? card.value.intakeCentreline : null);

  const cam = record.cam.checks.map((check): CamCheckResult => {
    if (!filled(check.openingSide, check.closingSide)) {
      return { centreline: null, correction: null, final: check.final };
    }
    const centreline = attempt(() =>
      intakeCentreline({
        openingSide: check.openingSide!,
        closingSide: check.closingSide!,
        ...(installCentreline ? { specCentreline: installCentreline } : {}),
      }),
    );
    const correction =
      centreline.ok && installCentreline
        ? attempt(() =>
            camCorrection({
              measuredCentreline: centreline.value.centreline,
              specCentreline: installCentreline,
            }),
          )
        : null;
    return { centreline, correction, final: check.final };
  });

  const s = specs.spring;
  const minMargin = inRecordUnit(settings.minCoilBindMargin, settings.lengthUnit, unit);
  const springs = record.springs.rows.map((row): SpringRowResult => {
    const height = row.installedHeight ?? s.installedHeight;
    const load = row.seatLoad;
    if (!filled(height, load, s.rate, s.lift)) {
      return { cylinder: row.cylinder, valve: row.valve, result: null, flags: [] };
    }
    const result = attempt(() =>
      valveSpring({
        installedLoad: load!,
        rate: s.rate!,
        installedHeight: height!,
        lift: s.lift!,
        ...(row.shim ? { shim: row.shim } : {}),
        ...(s.solidHeight ? { solidHeight: s.solidHeight } : {}),
      }),
    );
    const flags: string[] = [];
    if (result.ok) {
      const seat = new Decimal(result.value.seatLoad);
      if (s.seatLoadMin && seat.lt(s.seatLoadMin)) flags.push("seat load below the window");
      if (s.seatLoadMax && seat.gt(s.seatLoadMax)) flags.push("seat load above the window");
      if (result.value.coilBind) flags.push("goes solid before full lift");
      else if (
        minMargin &&
        result.value.coilBindMargin !== undefined &&
        new Decimal(result.value.coilBindMargin).lt(minMargin)
      ) {
        flags.push("coil-bind margin below the shop's smallest");
      }
    }
    return { cylinder: row.cylinder, valve: row.valve, result, flags };
  });

  const clearances = record.clearances.rows.map((row): ClearanceRowResult => {
    const grid = (g: (string | null)[][]) =>
      g.map((p) => p.filter((v): v is string => v !== null)).filter((p) => p.length > 0);
    const bore = grid(row.bore);
    const journal = grid(row.journalDiameter);
    const engine = specs.clearance[row.kind];
    let window: ClearanceRowResult["window"] = { min: null, max: null, from: null };
    if (engine.min !== null || engine.max !== null) {
      window = { min: engine.min, max: engine.max, from: "engine" };
    }
    if (bore.length === 0 || journal.length === 0) {
      return { kind: row.kind, journal: row.journal, result: null, window };
    }
    const perInch = settings.clearancePerInch;
    if (window.from === null && (perInch.min !== null || perInch.max !== null)) {
      // The shop's guide scaled by this journal's diameter (the smallest reading).
      const d = Decimal.min(...journal.flat());
      window = {
        min: perInch.min === null ? null : d.times(perInch.min).toString(),
        max: perInch.max === null ? null : d.times(perInch.max).toString(),
        from: "shop",
      };
    }
    const result = attempt(() =>
      bearingClearance({
        bore,
        journal,
        ...(window.min !== null ? { minClearance: window.min } : {}),
        ...(window.max !== null ? { maxClearance: window.max } : {}),
      }),
    );
    return { kind: row.kind, journal: row.journal, result, window };
  });

  const k = specs.compression;
  const deck = record.deck.rows.map((row): DeckRowResult => {
    const chamber = row.chamberCc ?? k.chamberCc;
    const quench =
      row.deckClearance !== null && k.gasketThickness !== null
        ? new Decimal(row.deckClearance).plus(k.gasketThickness).toString()
        : null;
    if (
      !filled(specs.bore, specs.stroke, chamber, k.gasketBore, k.gasketThickness, row.deckClearance)
    ) {
      return { cylinder: row.cylinder, result: null, quench };
    }
    const result = attempt(() =>
      compressionRatio({
        bore: specs.bore!,
        stroke: specs.stroke!,
        chamberCc: chamber!,
        gasketBore: k.gasketBore!,
        gasketThickness: k.gasketThickness!,
        deckClearance: row.deckClearance!,
        pistonCc: k.pistonCc ?? "0",
        lengthUnit: unit,
      }),
    );
    return { cylinder: row.cylinder, result, quench };
  });

  return { rings, tdc, card, installCentreline, cam, springs, clearances, deck };
}
