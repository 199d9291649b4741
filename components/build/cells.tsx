"use client";

import type { InputHTMLAttributes, KeyboardEvent, ReactNode } from "react";
import { ChangedElsewhere } from "@/components/ui/changed-elsewhere";
import type { BuildSection } from "@/lib/build-record/schemas";
import type { SaveState, SectionProps } from "./use-build-record";

/** Blank is "not given"; a leading point gets its zero, as the server keeps it. */
export const typed = (v: string): string | null => {
  const t = v.trim();
  return t === "" ? null : t.replace(/^(-?)\./, "$10.");
};

/** The colour of a worked-out status: in the window, still to work on, or wrong. */
export const STATUS_CLASS: Record<string, string> = {
  ok: "text-within",
  tight: "text-machine",
  wide: "text-replace",
  interference: "text-replace",
};

/** Enter moves to the next figure (Shift+Enter back), at once; leaving a box saves it. */
function moveOnEnter(e: KeyboardEvent<HTMLDivElement>) {
  const target = e.target as HTMLElement;
  if (e.key !== "Enter" || !target.matches("input[data-cell]")) return;
  e.preventDefault();
  const cells = Array.from(
    e.currentTarget.querySelectorAll<HTMLInputElement>("input[data-cell]:not([readonly])"),
  );
  const at = cells.indexOf(target as HTMLInputElement);
  const next = cells[at + (e.shiftKey ? -1 : 1)];
  if (next) {
    next.focus();
    next.select();
  } else (target as HTMLInputElement).blur();
}

/** The keyboard grid: every Cell inside is one stop of Enter / Shift+Enter, across sections. */
export function KeyboardGrid({ className, children }: { className?: string; children: ReactNode }) {
  return (
    <div className={className} onKeyDown={moveOnEnter}>
      {children}
    </div>
  );
}

/**
 * What a section's boxes and panel need from the editor: its save state, a commit that saves it
 * (never when read only), the refusal by field, and the panel's props.
 */
export function bindSection(props: SectionProps, section: BuildSection) {
  const state = props.editor.state[section];
  return {
    state,
    /** Saves the section (on leaving a box, a tick, a choice); never when read only. */
    commit: () => {
      if (!props.readOnly) void props.editor.save(section);
    },
    error: (path: string) => fieldError(state, path),
    ro: props.readOnly ? { readOnly: true } : {},
    panel: {
      section,
      state,
      onResolve: (keep: "theirs" | "mine") => void props.editor.resolveStale(section, keep),
    },
  };
}

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

/** Each section in the machinist's words, for "someone else changed … since this page loaded". */
const SECTION_WHAT: Record<BuildSection, string> = {
  specs: "the engine's own figures",
  rings: "the ring gaps",
  tdc: "the TDC readings",
  cam: "the cam checks",
  springs: "the valve springs",
  clearances: "the bearing clearances",
  deck: "the deck clearances",
};

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
      <span data-testid={testId} className="text-sm">
        <ChangedElsewhere
          inline
          what={SECTION_WHAT[section]}
          error={state.error}
          onReload={() => onResolve("theirs")}
        >
          <button type="button" className="underline" onClick={() => onResolve("mine")}>
            Save mine over it
          </button>
        </ChangedElsewhere>
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
