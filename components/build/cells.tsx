"use client";

import {
  type HTMLAttributes,
  type InputHTMLAttributes,
  type KeyboardEvent,
  type ReactNode,
  useId,
} from "react";
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

/** A figure the job already holds, offered in a blank box: Enter takes it. */
export interface Offered {
  value: string;
  unit: string;
}

/**
 * A labelled figure for the engine's own figures. `offered` (a figure the job holds) is said
 * beside a blank box, never shown as grey text in it, and Enter in the blank box takes it.
 */
export function LabelledCell(
  props: Parameters<typeof Cell>[0] & { unit?: string; offered?: Offered | null },
) {
  const { unit, offered, ...cell } = props;
  const hintId = useId();
  const offer = offered && !cell.value && !cell.readOnly ? offered : null;
  return (
    <div>
      <label className="flex items-center justify-between gap-2 text-sm">
        <span className="text-graphite-700">
          {props.label}
          {unit ? <span className="text-graphite-500"> ({unit})</span> : null}
        </span>
        <Cell
          {...cell}
          aria-describedby={offer ? hintId : undefined}
          onKeyDown={(e) => {
            // Runs before the grid moves on, so the figure taken is saved on leaving the box.
            if (offer && e.key === "Enter" && !e.shiftKey && e.currentTarget.value.trim() === "")
              cell.onChange(offer.value);
            cell.onKeyDown?.(e);
          }}
        />
      </label>
      {offer ? (
        <p id={hintId} className="mt-0.5 text-right text-xs text-graphite-600">
          Job: {offer.value} {offer.unit} — Enter takes it
        </p>
      ) : null}
    </div>
  );
}

/*
 * The section tables, read at the bench and on a phone. From the md width up they are plain
 * tables (one row per cylinder, valve or journal, Enter moving along the row); below it every row
 * stacks as a card, each figure on its own line with its column's words beside it, so the worked
 * out figures are never cut off at the panel's edge. The boxes stay in the same order either way.
 */

/** A section's table: the header row(s) in `head`, the rows (StackRow) as children. */
export function StackTable({ head, children }: { head: ReactNode; children: ReactNode }) {
  return (
    <table className="text-sm max-md:block max-md:w-full">
      <thead className="max-md:hidden">{head}</thead>
      <tbody className="max-md:block">{children}</tbody>
    </table>
  );
}

/**
 * One cylinder's, valve's or journal's row; `title` heads its card on a phone ("Cylinder 1,
 * intake"). `twoUp` sets short figures two to a line on a phone (StackCell `wide` takes a line).
 */
export function StackRow({
  title,
  twoUp = false,
  children,
  ...rest
}: { title: string; twoUp?: boolean; children: ReactNode } & HTMLAttributes<HTMLTableRowElement>) {
  return (
    <tr
      className={`max-md:mb-3 max-md:border-t max-md:border-graphite-200 max-md:pt-2 ${
        twoUp ? "max-md:grid max-md:grid-cols-2 max-md:gap-x-4" : "max-md:block"
      }`}
      {...rest}
    >
      <th
        scope="row"
        className="hidden text-left font-semibold max-md:col-span-2 max-md:block max-md:pb-1"
      >
        {title}
      </th>
      {children}
    </tr>
  );
}

/**
 * A cell of a section's table. `label` is its column's words, shown beside it on a phone (a cell
 * without one takes its line alone); `deskOnly` cells (the cylinder, the valve) are said by the
 * card's title on a phone instead; `phoneOnly` cells (a group's heading) only on a phone.
 */
export function StackCell({
  label,
  wide = false,
  deskOnly = false,
  phoneOnly = false,
  className = "",
  children,
  ...rest
}: {
  label?: string;
  wide?: boolean;
  deskOnly?: boolean;
  phoneOnly?: boolean;
  className?: string;
  children?: ReactNode;
} & Omit<HTMLAttributes<HTMLTableCellElement>, "className">) {
  const phone = deskOnly
    ? "max-md:hidden"
    : label
      ? "max-md:flex max-md:items-center max-md:justify-between max-md:gap-2 max-md:py-0.5 max-md:pr-0 max-md:text-right max-md:before:text-left max-md:before:font-sans max-md:before:text-graphite-600 max-md:before:content-[attr(data-label)]"
      : "max-md:block max-md:py-0.5 max-md:pr-0";
  return (
    <td
      data-label={label}
      className={`${className} ${phone} ${wide ? "max-md:col-span-2" : ""} ${
        phoneOnly ? "hidden max-md:block" : ""
      }`}
      {...rest}
    >
      {children}
    </td>
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
    // A table wider than the panel (a tablet's width) scrolls inside it, not the page; on a
    // phone the tables stack (StackTable).
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
