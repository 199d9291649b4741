import type { Kysely } from "kysely";
import type { CustomerInput } from "@/db/customers";
import { DEFAULT_SPEC, type Job, type JobSpec } from "@/db/jobs";
import { createJob, updateJobInTransaction } from "./save";
import { lockJob } from "@/db/dialect";
import type { Database, JobStatus } from "@/db/schema";
import { findShopSettings } from "@/db/settings";
import { listPartTargets, listPartWeights } from "@/db/weights";
import { may } from "@/lib/auth/policy";
import { convertLength, convertMassSetting, findLayoutPreset, parseDrillSize } from "@/lib/balance";
import { assertRequestsSettled } from "@/lib/build-record/requests";
import { HttpError } from "@/lib/http/errors";
import { tellReadyToCollect } from "@/lib/mail/events";
import { needsBobweight } from "./needs-bobweight";
import { COUNTER_SPEC_FIELDS } from "@/lib/validation/jobs";
import { type JobSpecInput, specMismatch } from "@/lib/validation/workshop";

/** A job setting refused for a reason the schema cannot see; the answer names the field. */
export class JobSettingError extends HttpError {
  constructor(field: string, code: string, message: string, status = 422) {
    super(status, code, message, { [field]: message });
  }
}

export const MASS_UNIT_WORDS = { g: "grams", oz: "ounces" } as const;

type SpecInput = Partial<JobSpecInput>;

/** What is already recorded in the job's mass unit; a unit switch would misread it. */
export interface RecordedMasses {
  weights: number;
  targets: number;
}

export interface ResolvedSpec {
  /** The columns to write. */
  spec: Partial<JobSpec>;
  /** What the server changed beyond what was typed, for the machinist to read after saving. */
  notices: string[];
}

const LENGTHS = [
  { typed: "bore", mm: "boreMm", entered: "boreEntered" },
  { typed: "stroke", mm: "strokeMm", entered: "strokeEntered" },
  { typed: "rodLength", mm: "rodLengthMm", entered: "rodLengthEntered" },
] as const;

const MASS_SETTINGS = [
  { key: "scaleResolution", label: "scale resolution", as: "resolution" },
  { key: "tolerance", label: "tolerance", as: "amount" },
  { key: "oilAllowance", label: "oil allowance per crankpin", as: "amount" },
  { key: "oilAllowancePerRod", label: "oil allowance per rod", as: "amount" },
] as const;

/**
 * Turns the settings as typed into the columns to store, against the job as it is:
 * - lengths typed in inches are kept as typed and converted to mm for the engine
 *   (1 in = 25.4 mm, NIST SP 811 App. B.8);
 * - a drill size as written ("3/8", "#21", "8.5 mm") is kept and read to mm;
 * - switching grams ↔ ounces converts the resolution, tolerance and oil allowance that were not
 *   retyped, and is refused while weights or targets are recorded in the old unit;
 * - a balance factor is not kept on a layout balanced without bobweights.
 *
 * @throws JobSettingError naming the field when the unit cannot change
 * @throws BalanceInputError naming `spec.drillSize` for a drill size that cannot be read
 */
export function resolveSpecChanges(
  current: JobSpec,
  input: SpecInput,
  recorded: RecordedMasses = { weights: 0, targets: 0 },
): ResolvedSpec {
  const { lengthUnit, bore, stroke, rodLength, drillSize, ...rest } = input;
  const spec: Partial<JobSpec> = { ...rest };
  const notices: string[] = [];
  const typed = { bore, stroke, rodLength };

  const unit = lengthUnit ?? current.lengthUnit;
  if (lengthUnit !== undefined) spec.lengthUnit = lengthUnit;
  for (const l of LENGTHS) {
    const value = typed[l.typed];
    if (value !== undefined) {
      spec[l.mm] = value === null ? null : unit === "mm" ? value : convertLength(value, "in", "mm");
      spec[l.entered] = value;
    } else if (rest[l.mm] !== undefined) {
      spec[l.entered] = unit === "mm" ? (rest[l.mm] ?? null) : null;
    } else if (unit !== current.lengthUnit && current[l.entered] !== null) {
      // Typed in the other unit: shown from the mm figure until typed again.
      spec[l.entered] = null;
    }
  }

  if (drillSize !== undefined) {
    const drill = drillSize === null ? null : parseDrillSize(drillSize, "spec.drillSize");
    spec.drillSize = drill?.entered ?? null;
    spec.drillDiameterMm = drill?.diameterMm ?? null;
  } else if (rest.drillDiameterMm !== undefined) {
    spec.drillSize = null;
  }

  const from = current.massUnit;
  const to = input.massUnit ?? from;
  if (to !== from) {
    const count = recorded.weights + recorded.targets;
    if (count > 0) {
      throw new JobSettingError(
        "spec.massUnit",
        "recorded_in_other_unit",
        `Weights in: this job already has ${count} weight${count === 1 ? "" : "s"} or target${count === 1 ? "" : "s"} recorded in ${MASS_UNIT_WORDS[from]}; keep ${MASS_UNIT_WORDS[from]}, or clear them first.`,
      );
    }
    const converted: string[] = [];
    for (const m of MASS_SETTINGS) {
      const sent = input[m.key];
      if (sent !== undefined && sent !== current[m.key]) continue;
      const value = current[m.key];
      // Nothing to convert where unset, nor the per-crankpin oil while the per-rod one is used.
      if (value === null || (m.key === "oilAllowance" && current.oilAllowancePerRod !== null)) {
        continue;
      }
      const next = convertMassSetting(value, from, to, m.as);
      spec[m.key] = next;
      converted.push(`${m.label} ${value} ${from} is now ${next} ${to}`);
    }
    notices.push(
      `Weights now in ${MASS_UNIT_WORDS[to]}: ${converted.length ? converted.join(", ") : "the mass settings were typed in the new unit"}. Check the resolution against the scale.`,
    );
  }

  const after = { ...current, ...spec };
  if (!needsBobweight(after)) {
    const dropped = input.balanceFactor ?? current.balanceFactor;
    if (dropped !== null && dropped !== undefined) {
      const label = findLayoutPreset(after.layout ?? "")?.label ?? "this layout";
      notices.push(
        `Balance factor ${dropped} % not kept: ${label} is balanced without bobweights (no bobweight needed).`,
      );
    }
    if (input.balanceFactor !== undefined || current.balanceFactor !== null) {
      spec.balanceFactor = null;
    }
  }
  return { spec, notices };
}

export interface SettingsActor {
  id: number;
  role: string;
}

export interface JobChangesInput {
  version: number;
  engine?: string;
  notes?: string | null;
  status?: JobStatus;
  spec?: SpecInput;
}

/**
 * Saves a job's settings: the counter may change only the booking fields, a preset layout
 * keeps its cylinder count, and the spec is resolved as {@link resolveSpecChanges} says.
 *
 * @returns the job as saved and what the machinist should read about it
 * @throws CounterFieldsError (403) for the counter's machinist-only fields; JobSettingError (422)
 * @throws StaleWriteError when `version` is not the stored one
 * @throws OpenRequestsError (409) moving to "ready" or "collected" with a request still open
 */
export async function updateJobSettings(
  db: Kysely<Database>,
  job: Job,
  changes: JobChangesInput,
  actor: SettingsActor,
): Promise<{ job: Job; notices: string[] }> {
  const { version, spec: input, ...rest } = changes;
  const machinistOnly = Object.keys(input ?? {}).filter(
    (k) => !(COUNTER_SPEC_FIELDS as readonly string[]).includes(k),
  );
  if (!may(actor, "edit-balancing-settings") && machinistOnly.length > 0) {
    throw new CounterFieldsError(machinistOnly);
  }
  const mismatch = specMismatch({ ...job.spec, ...input });
  if (mismatch) {
    const [field, message] = Object.entries(mismatch)[0]!;
    throw new JobSettingError(field, "invalid_input", message);
  }
  let resolved: ResolvedSpec = { spec: {}, notices: [] };
  if (input) {
    const switching = input.massUnit !== undefined && input.massUnit !== job.spec.massUnit;
    const recorded = switching
      ? {
          weights: (await listPartWeights(db, job.id)).filter((w) => w.readings.length > 0).length,
          targets: (await listPartTargets(db, job.id)).filter((t) => t.target !== null).length,
        }
      : { weights: 0, targets: 0 };
    resolved = resolveSpecChanges(job.spec, input, recorded);
  }
  const saved = await db.transaction().execute(async (trx) => {
    // No "ready" (or "collected") while a customer's request is neither done nor explained:
    // checked under the job's lock, which adding a request takes too, in the transaction that
    // writes the job, so a request added meanwhile is either seen here or added after.
    await lockJob(trx, job.id);
    await assertRequestsSettled(trx, job, rest.status);
    return updateJobInTransaction(trx, job.id, version, { ...rest, spec: resolved.spec }, actor.id);
  });
  // The customer hears the job is ready when it first moves there (through the outbox).
  if (saved.status === "ready" && job.status !== "ready")
    await tellReadyToCollect(db, saved.id, actor.id);
  return { job: saved, notices: resolved.notices };
}

/** The counter sent settings that are the machinist's: 403 naming each field. */
export class CounterFieldsError extends HttpError {
  constructor(keys: string[]) {
    super(
      403,
      "forbidden",
      "Balancing settings are the machinist's.",
      Object.fromEntries(keys.map((k) => [`spec.${k}`, "The machinist sets this."])),
    );
  }
}

/**
 * Books a job in with its settings resolved the same way as a later change. A customer given as
 * `customer` (met at the counter) is saved with the job in one transaction: a refused booking
 * leaves no customer behind, and a retry cannot save them twice.
 */
export async function bookJob(
  db: Kysely<Database>,
  input: {
    customerId?: number;
    customer?: CustomerInput;
    engine: string;
    notes?: string | null;
    spec: SpecInput;
  },
  actorId: number,
): Promise<{ job: Job; notices: string[] }> {
  if (input.customerId === undefined && input.customer === undefined) {
    throw new HttpError(422, "invalid_input", "Choose a customer, or add a new one.", {
      customerId: "Customer: choose one from the search, or add a new one.",
    });
  }
  const mismatch = specMismatch(input.spec);
  if (mismatch) {
    const [field, message] = Object.entries(mismatch)[0]!;
    throw new JobSettingError(field, "invalid_input", message);
  }
  // A new job starts with the shop's oil allowance per rod (grams, converted for a job in
  // ounces) unless the booking gives one, or gives the older per-crankpin figure instead.
  const byPin =
    input.spec.oilAllowance !== undefined && input.spec.oilAllowancePerRod === undefined;
  const oilAllowancePerRod = byPin ? null : (await findShopSettings(db)).oilAllowancePerRodG;
  const base: JobSpec = { ...DEFAULT_SPEC, oilAllowancePerRod };
  const { spec, notices } = resolveSpecChanges(base, input.spec);
  const { customer, customerId, ...rest } = input;
  const job = await createJob(
    db,
    {
      ...rest,
      customerId: customerId ?? 0,
      newCustomer: customer,
      spec: { oilAllowancePerRod, ...spec },
    },
    actorId,
  );
  return { job, notices };
}
