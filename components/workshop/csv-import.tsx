"use client";

import { useMutation } from "@tanstack/react-query";
import { useState } from "react";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { WeighPhase } from "@/db/schema";
import { ApiError, apiFetch } from "@/lib/api-client";
import type { CsvPreview } from "@/lib/workshop/csv";
import type { ImportOutcome } from "@/lib/workshop/import-weights";
import { KIND_LABEL } from "./part-kinds";
import { useReloadWorkshop, useUpdateWorkshop } from "./use-workshop";

/** Weights from a spreadsheet or a scale's logger: preview what changes, then confirm. */
export function CsvImport({
  jobId,
  unit,
  onImported,
}: {
  jobId: number;
  unit: string;
  onImported?: () => void;
}) {
  const update = useUpdateWorkshop(jobId);
  const [csv, setCsv] = useState("");
  const [fileName, setFileName] = useState("");
  const [phase, setPhase] = useState<WeighPhase>("initial");
  const [preview, setPreview] = useState<CsvPreview | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const send = useMutation({
    mutationFn: (confirm: boolean) =>
      apiFetch<ImportOutcome>(`/api/jobs/${jobId}/weights/import`, {
        method: "POST",
        body: {
          csv,
          phase,
          confirm,
          ...(confirm && preview
            ? {
                basedOn: Object.fromEntries(
                  preview.changes.map((c) => [`${c.cylinder}:${c.kind}:${c.phase}`, c.version]),
                ),
              }
            : {}),
        },
      }),
    onSuccess: (outcome) => {
      if (outcome.confirmed) {
        update(() => outcome.workshop);
        setDone(`${outcome.imported} weight${outcome.imported === 1 ? "" : "s"} imported.`);
        setPreview(null);
        onImported?.();
      } else {
        setDone(null);
        setPreview(outcome.preview);
      }
    },
  });

  const latest = useReloadWorkshop(jobId);
  /** After a stale import: every bench screen gets the weights as saved now, and a new preview. */
  async function loadLatest() {
    await latest.reload();
    setPreview(null);
    send.mutate(false);
  }

  return (
    <section className="panel space-y-3 p-4" aria-labelledby="csv-title">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="csv-title" className="font-semibold">
          Weights from a CSV file
        </h2>
        <span className="text-sm">
          Download:{" "}
          <a className="underline" href={`/api/jobs/${jobId}/weights/csv`}>
            weigh-in
          </a>{" "}
          ·{" "}
          <a className="underline" href={`/api/jobs/${jobId}/plan/csv`}>
            removal plan
          </a>
        </span>
      </div>
      <p className="text-sm text-graphite-600">
        Either one row per reading (<code>cylinder, part, weight</code>, optional <code>phase</code>
        ) or one row per cylinder with a column per part (
        <code>cylinder, piston, wrist pin, small end, …</code>). Weights in {unit}. Nothing is saved
        until you confirm.
      </p>
      <div className="flex flex-wrap items-end gap-3 text-sm">
        <label>
          <span className="mb-1 block font-semibold">File</span>
          <input
            type="file"
            accept=".csv,text/csv,text/plain"
            onChange={async (e) => {
              const file = e.target.files?.[0];
              setPreview(null);
              setDone(null);
              setFileName(file?.name ?? "");
              setCsv(file ? await file.text() : "");
            }}
          />
        </label>
        <label>
          <span className="mb-1 block font-semibold">Rows without a phase are</span>
          <select
            className="rounded border border-graphite-300 px-2 py-1.5"
            value={phase}
            onChange={(e) => setPhase(e.target.value as WeighPhase)}
          >
            <option value="initial">first weigh</option>
            <option value="final">after machining</option>
          </select>
        </label>
        <button
          type="button"
          className="btn-secondary"
          disabled={!csv || send.isPending}
          onClick={() => send.mutate(false)}
        >
          Show what would change
        </button>
      </div>
      {isStaleWrite(send.error) ? (
        <ChangedElsewhere
          what="some of these weights (since the preview)"
          onReload={() => void loadLatest()}
          loading={latest.loading || send.isPending}
        >
          <span className="block text-graphite-700">
            Loading the latest shows what the file would change now; nothing is saved until you
            confirm again.
          </span>
        </ChangedElsewhere>
      ) : send.isError ? (
        <p className="text-sm text-replace" aria-live="polite">
          {send.error instanceof ApiError
            ? (Object.values(send.error.fields)[0] ?? send.error.message)
            : "The server could not be reached."}
        </p>
      ) : null}
      {done ? (
        <p className="text-sm text-within" aria-live="polite">
          {done}
        </p>
      ) : null}
      {preview ? (
        <div className="space-y-3" data-testid="csv-preview">
          <p className="text-sm">
            {fileName}: read as {preview.format}. {preview.changes.length} change
            {preview.changes.length === 1 ? "" : "s"}, {preview.unchanged} already as saved,{" "}
            {preview.errors.length} row{preview.errors.length === 1 ? "" : "s"} refused.
          </p>
          {preview.errors.length > 0 ? (
            <ul
              className="rounded border border-replace/40 bg-red-50 p-2 text-sm text-replace"
              data-testid="csv-errors"
            >
              {preview.errors.map((e, i) => (
                <li key={i}>
                  Line {e.line}: {e.message}
                </li>
              ))}
            </ul>
          ) : null}
          {preview.changes.length > 0 ? (
            <table className="text-sm">
              <thead className="text-left text-graphite-500">
                <tr>
                  <th className="pr-4 font-semibold">Cyl.</th>
                  <th className="pr-4 font-semibold">Part</th>
                  <th className="pr-4 font-semibold">Phase</th>
                  <th className="pr-4 font-semibold">Now</th>
                  <th className="font-semibold">From the file</th>
                </tr>
              </thead>
              <tbody className="font-mono">
                {preview.changes.map((c) => (
                  <tr key={`${c.cylinder}:${c.kind}:${c.phase}`}>
                    <td className="pr-4">{c.cylinder}</td>
                    <td className="pr-4 font-sans">{KIND_LABEL[c.kind]}</td>
                    <td className="pr-4 font-sans">{c.phase === "initial" ? "first" : "final"}</td>
                    <td className="pr-4">{c.current.join(" ") || "—"}</td>
                    <td>{c.next.join(" ")}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : null}
          <button
            type="button"
            className="btn-primary"
            disabled={preview.changes.length === 0 || send.isPending}
            onClick={() => send.mutate(true)}
          >
            Import {preview.changes.length} weight{preview.changes.length === 1 ? "" : "s"}
          </button>
        </div>
      ) : null}
    </section>
  );
}
