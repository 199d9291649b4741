import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import { StaleWriteError } from "@/db/errors";
import { listPartWeights } from "@/db/weights";
import { savePartWeights } from "./save-weight";
import type { WeighPhase } from "@/db/schema";
import { type CsvPreview, previewWeightsCsv } from "./csv";
import { loadWorkshop, type Workshop } from "./load";

export type ImportOutcome =
  | { confirmed: false; preview: CsvPreview }
  | { confirmed: true; preview: CsvPreview; imported: number; workshop: Workshop };

/**
 * Previews a CSV of weights, or (confirmed) writes the rows that read cleanly in one transaction.
 * Rows with errors are never written; they are reported with their line and reason.
 */
export async function importWeightsCsv(
  db: DB,
  job: Job,
  input: { csv: string; phase: WeighPhase; confirm: boolean; basedOn?: Record<string, number> },
  actorId: number,
): Promise<ImportOutcome> {
  const preview = previewWeightsCsv(input.csv, job, await listPartWeights(db, job.id), input.phase);
  if (!input.confirm) return { confirmed: false, preview };
  if (input.basedOn) {
    for (const c of preview.changes) {
      const seen = input.basedOn[`${c.cylinder}:${c.kind}:${c.phase}`];
      if (seen !== undefined && seen !== c.version) throw new StaleWriteError("weight", c.version);
    }
  }
  await savePartWeights(
    db,
    preview.changes.map((c) => ({
      jobId: job.id,
      cylinder: c.cylinder,
      kind: c.kind,
      phase: c.phase,
      readings: c.next,
      baseVersion: c.version,
    })),
    actorId,
  );
  return {
    confirmed: true,
    preview,
    imported: preview.changes.length,
    workshop: await loadWorkshop(db, job),
  };
}
