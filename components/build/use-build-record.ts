"use client";

import { useCallback, useRef, useState } from "react";
import { isStaleWrite } from "@/components/ui/changed-elsewhere";
import { ApiError, apiFetch } from "@/lib/api-client";
import type { BuildRecordResults } from "@/lib/build-record/evaluate";
import type { BuildRecordView, SectionState } from "@/lib/build-record/record";
import type { BuildRecordData, BuildSection } from "@/lib/build-record/schemas";
import type { BuildSettings } from "@/lib/build-record/settings-schema";

export type SaveState =
  | { kind: "idle" }
  | { kind: "saving" }
  | { kind: "saved"; at: string }
  | { kind: "refused"; message: string; fields: Record<string, string> }
  /** Someone else saved the section since it was read (409 stale write); `error` is the refusal. */
  | { kind: "stale"; error: unknown }
  | { kind: "offline"; message: string };

/**
 * The build record on the screen: the sections as typed, each saved on its own with the version
 * it was based on. Saves of one section queue up (the second waits for the first's new version),
 * so fast typing across cells never trips its own stale check; a save refused as stale keeps the
 * typed figures and offers the stored ones.
 */
export function useBuildRecord(initial: BuildRecordView) {
  const [data, setData] = useState<BuildRecordData>(initial.data);
  const dataRef = useRef(data);
  const versions = useRef<Record<BuildSection, SectionState>>({ ...initial.versions });
  const dirty = useRef(new Set<BuildSection>());
  const queue = useRef<Partial<Record<BuildSection, Promise<void>>>>({});
  const [state, setState] = useState<Partial<Record<BuildSection, SaveState>>>({});

  const update = useCallback(
    <S extends BuildSection>(
      section: S,
      next: (current: BuildRecordData[S]) => BuildRecordData[S],
    ) => {
      const value = next(dataRef.current[section]);
      dataRef.current = { ...dataRef.current, [section]: value };
      dirty.current.add(section);
      setData(dataRef.current);
    },
    [],
  );

  const send = useCallback(
    async (section: BuildSection) => {
      if (!dirty.current.has(section)) return;
      dirty.current.delete(section);
      setState((s) => ({ ...s, [section]: { kind: "saving" } }));
      try {
        const { record } = await apiFetch<{ record: BuildRecordView }>(
          `/api/jobs/${initial.jobId}/build/${section}`,
          {
            method: "PUT",
            body: { version: versions.current[section].version, data: dataRef.current[section] },
          },
        );
        versions.current[section] = record.versions[section];
        setState((s) => ({
          ...s,
          [section]: { kind: "saved", at: record.versions[section].updatedAt ?? "" },
        }));
      } catch (e) {
        dirty.current.add(section);
        if (isStaleWrite(e)) {
          setState((s) => ({ ...s, [section]: { kind: "stale", error: e } }));
        } else if (e instanceof ApiError) {
          setState((s) => ({
            ...s,
            [section]: { kind: "refused", message: e.message, fields: e.fields },
          }));
        } else {
          setState((s) => ({
            ...s,
            [section]: { kind: "offline", message: "Could not reach the server; not saved yet." },
          }));
        }
      }
    },
    [initial.jobId],
  );

  /** Saves the section if it changed, after any save of it already on its way. */
  const save = useCallback(
    (section: BuildSection) => {
      const previous = queue.current[section] ?? Promise.resolve();
      const next = previous.then(() => send(section));
      queue.current[section] = next;
      return next;
    },
    [send],
  );

  /** After a stale refusal: take the stored section (theirs) or keep ours over it. */
  const resolveStale = useCallback(
    async (section: BuildSection, keep: "theirs" | "mine") => {
      const { record } = await apiFetch<{ record: BuildRecordView }>(
        `/api/jobs/${initial.jobId}/build`,
      );
      versions.current[section] = record.versions[section];
      if (keep === "theirs") {
        dataRef.current = { ...dataRef.current, [section]: record.data[section] };
        dirty.current.delete(section);
        setData(dataRef.current);
        setState((s) => ({ ...s, [section]: { kind: "idle" } }));
      } else {
        dirty.current.add(section);
        await save(section);
      }
    },
    [initial.jobId, save],
  );

  return { data, update, save, state, resolveStale };
}

/** The build record being typed into, as one section's component receives it. */
export type BuildRecordEditor = ReturnType<typeof useBuildRecord>;

/** What every section of the screen is given. */
export interface SectionProps {
  editor: BuildRecordEditor;
  /** What the record as typed works out to (the same function the server checks with). */
  results: BuildRecordResults;
  settings: BuildSettings;
  readOnly: boolean;
  /** The engine's cylinder numbers, 1 to n. */
  cylinders: number[];
}

/**
 * A section's rows with one row changed: the row `matches` picks (or `blank` when there is none
 * yet) passed through `change`, then only the rows `keep` says still hold something.
 */
export function upsertRow<R>(
  rows: readonly R[],
  matches: (row: R) => boolean,
  blank: R,
  change: (row: R) => R,
  keep: (row: R) => boolean,
): R[] {
  const next = [...rows];
  const i = next.findIndex(matches);
  const row = change(i >= 0 ? next[i]! : blank);
  if (i >= 0) next[i] = row;
  else next.push(row);
  return next.filter(keep);
}
