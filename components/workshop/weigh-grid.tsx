"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import Decimal from "decimal.js";
import { type KeyboardEvent, useEffect, useMemo, useRef, useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import type { PartKind, WeighPhase } from "@/db/schema";
import type { PartWeight } from "@/db/weights";
import { ApiError, apiFetch } from "@/lib/api-client";
import { formatDerivedMass } from "@/lib/balance";
import { readingsTextSchema, readingsTextSchemaFor } from "@/lib/validation/readings";
import { checkPartWeight } from "@/lib/workshop/outliers";
import type { WorkshopPlan } from "@/lib/workshop/plan";
import type { Workshop } from "@/lib/workshop/load";
import { WEIGH_COLUMNS } from "./part-kinds";
import { useUpdateWorkshop, useWorkshop } from "./use-workshop";

type CellState = {
  state: "saving" | "saved" | "error" | "conflict" | "held";
  message?: string;
  theirs?: string;
  /** For "held": the readings the server would not use until they are confirmed. */
  text?: string;
};
type CommitOptions = {
  /** Send even when the text is what the server holds (a confirmation, "Save mine"). */
  version?: number;
  /** The machinist keeps readings far from the rest of the kind (lib/workshop/outliers.ts). */
  confirm?: boolean;
  /** Move to the confirmation when the server holds the readings (the Enter flow). */
  focusHeld?: boolean;
};
type Order = "by-kind" | "by-cylinder";

const fieldName = (cylinder: number, kind: PartKind) => `c${cylinder}_${kind}`;

function cellText(weights: PartWeight[], phase: WeighPhase, cylinder: number, kind: PartKind) {
  return (
    weights
      .find((w) => w.phase === phase && w.cylinder === cylinder && w.kind === kind)
      ?.readings.join(" ") ?? ""
  );
}

function spreadOf(text: string, rule = readingsTextSchema): string | null {
  const parsed = rule.safeParse(text);
  if (!parsed.success || parsed.data.length < 2) return null;
  const values = parsed.data.map((v) => new Decimal(v));
  return Decimal.max(...values)
    .minus(Decimal.min(...values))
    .toString();
}

/**
 * The weigh-in: one row per cylinder, one column per kind of part. Digits and Enter: each Enter
 * saves the cell and moves on in bench order (down a column, or along a row).
 *
 * A weight far from the rest of its kind (a missed decimal point) is held: the server refuses it
 * (422 "outlier") until it is confirmed. When the grid sees one coming on Enter it stays on the
 * part, sends it, and puts the server's answer with a "Keep" button in front of the machinist:
 * Enter keeps the readings as read (sent again with `confirmOutlier`), Escape goes back to retype.
 */
export function WeighGrid({
  jobId,
  initial,
  canEdit,
}: {
  jobId: number;
  initial: Workshop;
  canEdit: boolean;
}) {
  const { data } = useWorkshop(jobId, initial);
  const workshop = data ?? initial;
  const update = useUpdateWorkshop(jobId);
  const cylinders = Array.from({ length: workshop.job.spec.cylinders ?? 0 }, (_, i) => i + 1);
  const [phase, setPhase] = useState<WeighPhase>("initial");
  const [order, setOrder] = useState<Order>(workshop.job.spec.benchOrder);
  const [cells, setCells] = useState<Record<string, CellState>>({});
  const [announce, setAnnounce] = useState("");
  // Set once the grid is live in the browser: typing before that would be lost to hydration.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);
  const inputs = useRef<Record<string, HTMLInputElement | null>>({});
  // What the server holds for each cell of this phase: read synchronously between Enter and blur.
  const saved = useRef<Record<string, { text: string; version: number }>>({});
  const inflight = useRef<Record<string, string>>({});
  // Readings the server held: the blur that follows moving to "Keep" must not send them again.
  const held = useRef<Record<string, string>>({});
  const keepButtons = useRef<Record<string, HTMLButtonElement | null>>({});
  const unit = workshop.job.spec.massUnit;
  // What a keyboard-wedge scale types ("+ 498.6 g") is read too, in the job's unit.
  const readingRule = useMemo(() => readingsTextSchemaFor(unit), [unit]);

  const schema = useMemo(
    () =>
      z.object(
        Object.fromEntries(
          cylinders.flatMap((c) =>
            WEIGH_COLUMNS.map((col) => [fieldName(c, col.kind), readingRule]),
          ),
        ),
      ),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [cylinders.length],
  );
  const defaults = (p: WeighPhase, weights = workshop.weights) => {
    const values: Record<string, string> = {};
    for (const c of cylinders) {
      for (const col of WEIGH_COLUMNS) {
        const name = fieldName(c, col.kind);
        const found = weights.find((w) => w.phase === p && w.cylinder === c && w.kind === col.kind);
        values[name] = found?.readings.join(" ") ?? "";
        saved.current[name] = { text: values[name], version: found?.version ?? 0 };
      }
    }
    return values;
  };
  const [firstValues] = useState(() => defaults("initial"));
  const form = useForm<Record<string, string>>({
    resolver: zodResolver(schema) as never,
    defaultValues: firstValues,
    mode: "onChange",
  });

  const sequence = useMemo(() => {
    const kinds = WEIGH_COLUMNS.map((c) => c.kind);
    return order === "by-kind"
      ? kinds.flatMap((k) => cylinders.map((c) => fieldName(c, k)))
      : cylinders.flatMap((c) => kinds.map((k) => fieldName(c, k)));
  }, [order, cylinders]);

  const save = useMutation({
    mutationFn: (body: {
      cylinder: number;
      kind: PartKind;
      readings: string[];
      version: number;
      confirmOutlier?: true;
    }) =>
      apiFetch<{ weight: PartWeight | null; plan: WorkshopPlan }>(`/api/jobs/${jobId}/weights`, {
        method: "PUT",
        body: { ...body, phase },
      }),
  });

  const versionOf = (cylinder: number, kind: PartKind) =>
    saved.current[fieldName(cylinder, kind)]?.version ?? 0;

  async function commit(cylinder: number, kind: PartKind, options: CommitOptions = {}) {
    const name = fieldName(cylinder, kind);
    const text = form.getValues(name) ?? "";
    const parsed = readingRule.safeParse(text);
    if (!parsed.success) {
      await form.trigger(name);
      return false;
    }
    const readings = parsed.data;
    const joined = readings.join(" ");
    const forced = options.version !== undefined || options.confirm === true;
    // Enter moves on at once and the blur saves; a second call for the same text is not a new write.
    if (!forced && (joined === saved.current[name]?.text || joined === inflight.current[name]))
      return true;
    // Held readings wait for "Keep" or a retype; leaving the box does not send them again.
    if (!forced && joined === held.current[name]) return false;
    delete held.current[name];
    inflight.current[name] = joined;
    setCells((s) => ({ ...s, [name]: { state: "saving" } }));
    try {
      const result = await save.mutateAsync({
        cylinder,
        kind,
        readings,
        version: options.version ?? versionOf(cylinder, kind),
        ...(options.confirm ? { confirmOutlier: true as const } : {}),
      });
      saved.current[name] = { text: joined, version: result.weight?.version ?? 0 };
      update((w) => ({
        ...w,
        plan: result.plan,
        weights: [
          ...w.weights.filter(
            (x) => !(x.phase === phase && x.cylinder === cylinder && x.kind === kind),
          ),
          ...(result.weight ? [result.weight] : []),
        ],
      }));
      setCells((s) => ({ ...s, [name]: { state: "saved" } }));
      setAnnounce(`Cylinder ${cylinder} ${kind}: saved`);
      return true;
    } catch (error) {
      if (error instanceof ApiError && error.status === 409) {
        const fresh = await apiFetch<Workshop>(`/api/jobs/${jobId}/workshop`);
        update(() => fresh);
        const theirs = cellText(fresh.weights, phase, cylinder, kind);
        const current = fresh.weights.find(
          (w) => w.phase === phase && w.cylinder === cylinder && w.kind === kind,
        );
        saved.current[name] = { text: theirs, version: current?.version ?? 0 };
        setCells((s) => ({
          ...s,
          [name]: {
            state: "conflict",
            theirs,
            message: `Changed elsewhere to ${theirs || "empty"}. Yours (${text || "empty"}) is not saved.`,
          },
        }));
        setAnnounce(`Cylinder ${cylinder} ${kind}: changed elsewhere, not saved`);
        return false;
      }
      if (
        error instanceof ApiError &&
        error.status === 422 &&
        error.body.error.code === "outlier"
      ) {
        held.current[name] = joined;
        setCells((s) => ({
          ...s,
          [name]: { state: "held", message: error.message, text: joined },
        }));
        setAnnounce(error.message);
        // The button exists once React has drawn the held state.
        if (options.focusHeld) setTimeout(() => keepButtons.current[name]?.focus(), 0);
        return false;
      }
      const message =
        error instanceof ApiError
          ? (Object.values(error.fields)[0] ?? error.message)
          : "Not saved: the server could not be reached.";
      setCells((s) => ({ ...s, [name]: { state: "error", message } }));
      setAnnounce(`Cylinder ${cylinder} ${kind}: not saved`);
      return false;
    } finally {
      delete inflight.current[name];
    }
  }

  const nextAfter = (name: string, back = false) =>
    sequence[sequence.indexOf(name) + (back ? -1 : 1)];

  /** The same rule as the server, on what this grid knows: worth waiting for its answer? */
  function looksHeld(cylinder: number, kind: PartKind, readings: string[]) {
    if (readings.length === 0) return false;
    const part = { cylinder, kind, phase, readings };
    try {
      return checkPartWeight(workshop.job, workshop.weights, part, workshop.outlierPercent).outlier;
    } catch {
      return false;
    }
  }

  function onKeyDown(event: KeyboardEvent<HTMLInputElement>, cylinder: number, kind: PartKind) {
    if (event.key !== "Enter") return;
    event.preventDefault();
    const name = fieldName(cylinder, kind);
    const parsed = readingRule.safeParse(form.getValues(name) ?? "");
    if (!parsed.success) {
      void form.trigger(name);
      return;
    }
    const next = nextAfter(name, event.shiftKey);
    const input = inputs.current[name];
    if (input?.readOnly && canEdit) return; // waiting for the server's answer on this part
    if (canEdit && input && !event.shiftKey && looksHeld(cylinder, kind, parsed.data)) {
      // Stay on the part until the server has answered: it is held, or it was fine after all.
      // Keys typed meanwhile are not added to the held figure.
      input.readOnly = true;
      void commit(cylinder, kind, { focusHeld: true }).then((ok) => {
        input.readOnly = false;
        if (ok && next) inputs.current[next]?.focus();
      });
      return;
    }
    // Moving on at once keeps up with fast typing; leaving the box saves it (onBlur).
    if (next) inputs.current[next]?.focus();
    else if (canEdit) void commit(cylinder, kind);
  }

  async function keep(cylinder: number, kind: PartKind) {
    const name = fieldName(cylinder, kind);
    const ok = await commit(cylinder, kind, { confirm: true, version: versionOf(cylinder, kind) });
    const next = nextAfter(name);
    if (ok && next) inputs.current[next]?.focus();
  }

  function retype(cylinder: number, kind: PartKind) {
    const name = fieldName(cylinder, kind);
    delete held.current[name];
    setCells((s) => ({ ...s, [name]: { state: "error", message: "Retype the weight." } }));
    const input = inputs.current[name];
    input?.focus();
    input?.select();
  }

  // Held here (the server's answer to this grid's save) or held in the plan (saved before, or an
  // outlier since other parts were weighed), for the phase on screen.
  const heldParts: {
    name: string;
    cylinder: number;
    kind: PartKind;
    message: string;
    text: string;
  }[] = [];
  for (const c of cylinders) {
    for (const col of WEIGH_COLUMNS) {
      const name = fieldName(c, col.kind);
      const cell = cells[name];
      if (cell?.state === "held") {
        heldParts.push({
          name,
          cylinder: c,
          kind: col.kind,
          message: cell.message ?? "",
          text: cell.text ?? "",
        });
        continue;
      }
      if (cell && cell.state !== "saved") continue;
      const fromPlan = (workshop.plan.held ?? []).find(
        (h) => h.phase === phase && h.cylinder === c && h.kind === col.kind,
      );
      if (fromPlan)
        heldParts.push({
          name,
          cylinder: c,
          kind: col.kind,
          message: fromPlan.message ?? "",
          text: saved.current[name]?.text ?? "",
        });
    }
  }
  const heldNames = new Set(heldParts.map((h) => h.name));

  function switchPhase(p: WeighPhase) {
    setPhase(p);
    setCells({});
    held.current = {};
    form.reset(defaults(p));
  }

  function keepTheirs(cylinder: number, kind: PartKind) {
    const name = fieldName(cylinder, kind);
    form.setValue(name, cells[name]?.theirs ?? "");
    setCells((s) => ({ ...s, [name]: { state: "saved" } }));
  }

  return (
    <section aria-labelledby="weigh-title" className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h2 id="weigh-title" className="text-xl font-semibold">
            {phase === "initial" ? "First weigh" : "Re-weigh after machining"}
          </h2>
          <p className="text-sm text-graphite-600">
            Type a weight and press Enter to save and move on (Shift+Enter goes back). Repeated
            readings: separate them with spaces. Weights in {unit === "g" ? "grams" : "ounces"};
            scale resolution {workshop.job.spec.scaleResolution} {unit}.
          </p>
        </div>
        <div className="flex flex-wrap gap-4 text-sm">
          <fieldset className="flex items-center gap-2">
            <legend className="sr-only">Which weighing</legend>
            {(["initial", "final"] as const).map((p) => (
              <label key={p} className="flex items-center gap-1">
                <input
                  type="radio"
                  name="phase"
                  checked={phase === p}
                  onChange={() => switchPhase(p)}
                />
                {p === "initial" ? "First weigh" : "After machining"}
              </label>
            ))}
          </fieldset>
          <fieldset className="flex items-center gap-2">
            <legend className="sr-only">Enter moves</legend>
            {(["by-kind", "by-cylinder"] as const).map((o) => (
              <label key={o} className="flex items-center gap-1">
                <input
                  type="radio"
                  name="order"
                  checked={order === o}
                  onChange={() => setOrder(o)}
                />
                {o === "by-kind"
                  ? "Enter goes down (all pistons first)"
                  : "Enter goes across (cylinder by cylinder)"}
              </label>
            ))}
          </fieldset>
        </div>
      </div>

      <div className="panel overflow-x-auto">
        <table
          className="w-full border-collapse text-sm"
          data-testid="weigh-grid"
          data-ready={ready ? "true" : "false"}
        >
          <thead className="bg-graphite-50 text-graphite-600">
            <tr>
              <th scope="col" className="px-2 py-2 text-left font-semibold">
                Cyl.
              </th>
              {WEIGH_COLUMNS.map((col) => (
                <th
                  key={col.kind}
                  scope="col"
                  className="px-2 py-2 text-left font-semibold"
                  title={col.label}
                >
                  {col.short}
                  {col.optional ? (
                    <span className="font-normal text-graphite-400"> (opt.)</span>
                  ) : null}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {cylinders.map((c) => (
              <tr key={c} className="border-t border-graphite-100">
                <th scope="row" className="px-2 py-1 text-left font-mono text-base">
                  {c}
                </th>
                {WEIGH_COLUMNS.map((col) => {
                  const name = fieldName(c, col.kind);
                  const cell = cells[name];
                  const error = form.formState.errors[name]?.message;
                  const value = form.watch(name) ?? "";
                  const spread = spreadOf(value, readingRule);
                  const reg = form.register(name);
                  return (
                    <td key={col.kind} className="px-1 py-1 align-top">
                      <input
                        {...reg}
                        ref={(el) => {
                          reg.ref(el);
                          inputs.current[name] = el;
                        }}
                        aria-label={`Cylinder ${c} ${col.label}, ${unit}`}
                        aria-invalid={
                          error || cell?.state === "error" || cell?.state === "conflict"
                            ? true
                            : undefined
                        }
                        inputMode="decimal"
                        autoComplete="off"
                        readOnly={!canEdit}
                        onKeyDown={(e) => onKeyDown(e, c, col.kind)}
                        onBlur={(e) => {
                          void reg.onBlur(e);
                          if (canEdit) void commit(c, col.kind);
                        }}
                        className={`w-24 rounded border px-2 py-1.5 font-mono text-base ${
                          cell?.state === "conflict" || cell?.state === "error" || error
                            ? "border-replace bg-red-50"
                            : cell?.state === "saved"
                              ? "border-within/60"
                              : "border-graphite-300"
                        }`}
                      />
                      <div className="min-h-4 text-xs" data-testid={`cell-note-${name}`}>
                        {error ? <span className="text-replace">{String(error)}</span> : null}
                        {cell?.state === "saving" ? (
                          <span className="text-graphite-500">saving…</span>
                        ) : null}
                        {cell?.state === "saved" ? (
                          <span className="text-within">saved</span>
                        ) : null}
                        {cell?.state === "error" ? (
                          <span className="text-replace">{cell.message}</span>
                        ) : null}
                        {heldNames.has(name) ? (
                          <span className="font-semibold text-machine">held: confirm below</span>
                        ) : null}
                        {cell?.state === "conflict" ? (
                          <span className="text-replace">
                            {cell.message}{" "}
                            <button
                              type="button"
                              className="underline"
                              onClick={() =>
                                void commit(c, col.kind, { version: versionOf(c, col.kind) })
                              }
                            >
                              Save mine
                            </button>{" "}
                            <button
                              type="button"
                              className="underline"
                              onClick={() => keepTheirs(c, col.kind)}
                            >
                              Keep theirs
                            </button>
                          </span>
                        ) : null}
                        {spread && !error ? (
                          <span className="ml-1 text-graphite-500">
                            spread {formatDerivedMass(spread, workshop.job.spec.scaleResolution)}
                          </span>
                        ) : null}
                      </div>
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {heldParts.length > 0 ? (
        <div
          role="group"
          aria-labelledby="held-title"
          className="space-y-2 rounded border border-machine/40 bg-amber-50 p-3 text-sm"
          data-testid="held-weights"
        >
          <h3 id="held-title" className="font-semibold">
            Held until you confirm or retype (the plan waits for these)
          </h3>
          <ul className="space-y-2">
            {heldParts.map((h) => (
              <li key={h.name} data-testid={`held-${h.name}`}>
                <span>{h.message}</span>{" "}
                <span className="whitespace-nowrap">
                  <button
                    type="button"
                    className="btn-secondary px-2 py-0.5 text-sm"
                    ref={(el) => {
                      keepButtons.current[h.name] = el;
                    }}
                    onClick={() => void keep(h.cylinder, h.kind)}
                    onKeyDown={(e) => {
                      if (e.key !== "Escape") return;
                      e.preventDefault();
                      retype(h.cylinder, h.kind);
                    }}
                  >
                    Keep {h.text} {unit} (Enter)
                  </button>{" "}
                  <button
                    type="button"
                    className="px-2 py-0.5 text-sm underline"
                    onClick={() => retype(h.cylinder, h.kind)}
                  >
                    Retype (Esc)
                  </button>
                </span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      <p aria-live="polite" className="sr-only" data-testid="weigh-announce">
        {announce}
      </p>
      <WeighProgress plan={workshop.plan} />
    </section>
  );
}

function WeighProgress({ plan }: { plan: WorkshopPlan }) {
  if (plan.complete)
    return <p className="text-sm text-within">Every part needed for the plan is weighed.</p>;
  if (plan.error) return <p className="text-sm text-replace">{plan.error.message}</p>;
  return (
    <p className="text-sm text-graphite-600">
      Still to weigh: {plan.missing.length} part{plan.missing.length === 1 ? "" : "s"} (optional
      kinds count once one cylinder has them).
    </p>
  );
}
