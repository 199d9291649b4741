"use client";

import type { InputHTMLAttributes, ReactNode } from "react";
import type { BuildSection } from "@/lib/build-record/schemas";
import type { SaveState } from "./use-build-record";

/**
 * A figure typed into the build record: digits, Enter moves on (the screen handles it), leaving
 * the box saves the section. `path` is the field's path in the section, for refusals.
 */
export function Cell({
  label,
  value,
  onChange,
  onCommit,
  error,
  className = "w-24",
  ...rest
}: {
  label: string;
  value: string | null;
  onChange: (value: string) => void;
  onCommit: () => void;
  error?: string;
  className?: string;
} & Omit<InputHTMLAttributes<HTMLInputElement>, "value" | "onChange">) {
  return (
    <input
      data-cell
      aria-label={label}
      title={error ?? label}
      aria-invalid={error ? true : undefined}
      inputMode="decimal"
      autoComplete="off"
      className={`rounded border px-1.5 py-1 text-right font-mono text-sm ${
        error ? "border-replace" : "border-graphite-300"
      } ${className}`}
      value={value ?? ""}
      onChange={(e) => onChange(e.target.value)}
      onBlur={onCommit}
      {...rest}
    />
  );
}

/** A labelled figure for the engine's own figures. */
export function LabelledCell(props: Parameters<typeof Cell>[0] & { unit?: string }) {
  const { unit, ...cell } = props;
  return (
    <label className="flex items-center justify-between gap-2 text-sm">
      <span className="text-graphite-700">
        {props.label}
        {unit ? <span className="text-graphite-500"> ({unit})</span> : null}
      </span>
      <Cell {...cell} />
    </label>
  );
}

/** A section of the build record with its save line. */
export function BuildPanel({
  section,
  title,
  state,
  onResolve,
  children,
  note,
}: {
  section: BuildSection;
  title: string;
  state: SaveState | undefined;
  onResolve: (keep: "theirs" | "mine") => void;
  children: ReactNode;
  note?: ReactNode;
}) {
  return (
    // Wide tables (springs, rings, deck) scroll inside their panel on a phone, not the page.
    <section
      className="panel min-w-0 overflow-x-auto p-4"
      aria-labelledby={`build-${section}`}
      data-section={section}
    >
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`build-${section}`} className="font-semibold">
          {title}
        </h2>
        <SaveLine state={state} onResolve={onResolve} section={section} />
      </div>
      {note ? <p className="mb-3 text-sm text-graphite-600">{note}</p> : null}
      {children}
    </section>
  );
}

function SaveLine({
  state,
  onResolve,
  section,
}: {
  state: SaveState | undefined;
  onResolve: (keep: "theirs" | "mine") => void;
  section: BuildSection;
}) {
  const testId = `save-${section}`;
  if (!state || state.kind === "idle") return <span data-testid={testId} />;
  if (state.kind === "saving")
    return (
      <span data-testid={testId} className="text-sm text-graphite-500">
        Saving…
      </span>
    );
  if (state.kind === "saved")
    return (
      <span data-testid={testId} className="text-sm text-within">
        Saved
      </span>
    );
  if (state.kind === "stale")
    return (
      <span data-testid={testId} className="flex flex-wrap items-center gap-2 text-sm text-replace">
        {state.message}
        <button type="button" className="btn-secondary py-0.5" onClick={() => onResolve("theirs")}>
          Load theirs
        </button>
        <button type="button" className="btn-secondary py-0.5" onClick={() => onResolve("mine")}>
          Keep mine
        </button>
      </span>
    );
  return (
    <span data-testid={testId} className="text-sm text-replace">
      {state.message}
      {state.kind === "refused" && Object.keys(state.fields).length > 0
        ? ` ${Object.values(state.fields)[0]}`
        : ""}
    </span>
  );
}

/** The refusal for one field of a section, if the last save was refused there. */
export function fieldError(state: SaveState | undefined, path: string): string | undefined {
  return state?.kind === "refused" ? state.fields[`data.${path}`] : undefined;
}
