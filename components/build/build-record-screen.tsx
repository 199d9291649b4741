"use client";

import { useMemo } from "react";
import { evaluateBuildRecord } from "@/lib/build-record/evaluate";
import type { BuildRecordView } from "@/lib/build-record/record";
import { CamSection } from "./cam-section";
import { KeyboardGrid } from "./cells";
import { ClearancesSection } from "./clearances-section";
import { DeckSection } from "./deck-section";
import { EngineFiguresSection } from "./engine-figures-section";
import { RingGapsSection } from "./ring-gaps-section";
import { SpringsSection } from "./springs-section";
import { TdcSection } from "./tdc-section";
import { type SectionProps, useBuildRecord } from "./use-build-record";

/**
 * The engine build record of a job, keyboard first: the engine's own figures, ring gaps, TDC,
 * cam checks, valve springs, bearing clearances, deck and compression, one component each, in
 * one keyboard grid (Enter moves on across sections) and one save hook (each section saved on
 * its own with the version it was based on). Every figure shown is worked out by the same
 * function the server checks with (lib/build-record/evaluate.ts).
 */
export function BuildRecordScreen({
  initial,
  cylinders,
  readOnly,
  jobBore,
  jobStroke = null,
}: {
  initial: BuildRecordView;
  cylinders: number;
  readOnly: boolean;
  /** The job's bore as entered and its unit, offered when the finished bore is blank. */
  jobBore: { value: string; unit: "in" | "mm" } | null;
  /** The job's stroke as entered and its unit, offered the same way when the stroke is blank. */
  jobStroke?: { value: string; unit: "in" | "mm" } | null;
}) {
  const editor = useBuildRecord(initial);
  const settings = initial.settings;
  const results = useMemo(
    () => evaluateBuildRecord(editor.data, settings),
    [editor.data, settings],
  );
  const cylinderNumbers = useMemo(
    () => Array.from({ length: cylinders }, (_, i) => i + 1),
    [cylinders],
  );
  const section: SectionProps = {
    editor,
    results,
    settings,
    readOnly,
    cylinders: cylinderNumbers,
  };
  const unit = editor.data.specs.lengthUnit;

  return (
    <KeyboardGrid className="space-y-6">
      <p className="rounded border border-brass-300 bg-brass-50 p-3 text-sm text-brass-700">
        Torque figures, clearances, gaps and spring loads are the engine maker&apos;s and the parts
        makers&apos; to give: this record keeps what was measured and works out what follows from
        it; it supports the builder&apos;s judgement and does not replace it. Turn the engine by
        hand with a piston stop fitted, never on the starter.
      </p>
      {readOnly ? (
        <p className="text-sm text-graphite-600">
          Read only: the machinist and the owner keep this record.
        </p>
      ) : (
        <p className="text-sm text-graphite-600">
          Type a figure and press Enter to move on (Shift+Enter goes back); leaving a box saves it.
          Lengths in {unit === "in" ? "inches" : "millimetres"}, shown as typed.
        </p>
      )}
      <EngineFiguresSection {...section} jobBore={jobBore} jobStroke={jobStroke} />
      <RingGapsSection {...section} />
      <div className="grid gap-6 lg:grid-cols-2">
        <TdcSection {...section} />
        <CamSection {...section} />
      </div>
      <SpringsSection {...section} />
      <ClearancesSection {...section} />
      <DeckSection {...section} />
    </KeyboardGrid>
  );
}
