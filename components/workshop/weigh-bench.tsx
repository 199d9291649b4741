"use client";

import { useState } from "react";
import { ConnectScale } from "@/components/scale/connect-scale";
import type { Workshop } from "@/lib/workshop/load";
import { CsvImport } from "./csv-import";
import { WeighGrid } from "./weigh-grid";

/** The weigh-in grid and the CSV import beside it; an import starts the grid afresh from what was saved. */
export function WeighBench({
  jobId,
  initial,
  canEdit,
}: {
  jobId: number;
  initial: Workshop;
  canEdit: boolean;
}) {
  const [imports, setImports] = useState(0);
  return (
    <div className="space-y-6">
      {canEdit ? (
        <ConnectScale
          unit={initial.job.spec.massUnit}
          resolution={initial.job.spec.scaleResolution}
        />
      ) : null}
      <WeighGrid key={imports} jobId={jobId} initial={initial} canEdit={canEdit} />
      {canEdit ? (
        <CsvImport
          jobId={jobId}
          unit={initial.job.spec.massUnit}
          onImported={() => setImports((n) => n + 1)}
        />
      ) : null}
    </div>
  );
}
