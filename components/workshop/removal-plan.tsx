"use client";

import { useMutation } from "@tanstack/react-query";
import { useState } from "react";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { PartKind } from "@/db/schema";
import { formatDerivedMass, formatMass, type PartResult } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import { shopDateTime } from "@/lib/dates/shop-time";
import type { Workshop } from "@/lib/workshop/load";
import {
  HOW_TO_REMOVE,
  HOW_TO_RESELECT,
  type PartProgress,
  type WorkshopPlan,
} from "@/lib/workshop/plan";
import { describePairingMoves } from "@/lib/workshop/pairing-history";
import { KIND_LABEL } from "./part-kinds";
import { PartChart } from "./part-chart";
import { useReloadWorkshop, useUpdateWorkshop, useWorkshop } from "./use-workshop";

const STATUS: Record<PartResult["status"], { label: string; className: string }> = {
  ok: { label: "In band", className: "bg-emerald-50 text-within" },
  remove: { label: "Take off", className: "bg-amber-50 text-machine" },
  light: { label: "Too light", className: "bg-red-50 text-replace font-semibold" },
  reselect: { label: "Re-select or replace", className: "bg-red-50 text-replace font-semibold" },
};

export function StatusTag({ status }: { status: PartResult["status"] }) {
  const s = STATUS[status];
  return (
    <span className={`inline-block rounded px-2 py-0.5 text-xs whitespace-nowrap ${s.className}`}>
      {s.label}
    </span>
  );
}

/** Where a part stands after the re-weigh, in words. */
function ProgressTag({ progress, show }: { progress: PartProgress; show: (v: string) => string }) {
  const amount = progress.amount ? show(progress.amount) : "";
  const [label, className] = {
    "to-do": [`Take off ${amount}`, "bg-amber-50 text-machine"],
    done: ["Done", "bg-emerald-50 text-within"],
    still: [`Still to take off ${amount}`, "bg-amber-50 text-machine font-semibold"],
    over: [`Over-machined, ${amount} light`, "bg-red-50 text-replace font-semibold"],
    reselect: ["Re-select or replace", "bg-red-50 text-replace font-semibold"],
  }[progress.state];
  return (
    <span className={`inline-block rounded px-2 py-0.5 text-xs whitespace-nowrap ${className}`}>
      {label}
    </span>
  );
}

type Show = { weighed: (v: string) => string; derived: (v: string) => string; unit: string };

/** Per kind of part: target, tolerance and, part by part, the metal to take off and where. */
export function RemovalPlan({
  jobId,
  initial,
  canEdit,
  timeZone = "UTC",
}: {
  jobId: number;
  initial: Workshop;
  canEdit: boolean;
  /** The shop's time zone (IANA name): the last pairing's time on the shop's clock. */
  timeZone?: string;
}) {
  const { data } = useWorkshop(jobId, initial);
  const workshop = data ?? initial;
  const { plan, job } = workshop;
  const res = job.spec.scaleResolution;
  const unit = job.spec.massUnit;
  const show: Show = {
    weighed: (v) => formatMass(v, res),
    derived: (v) => formatDerivedMass(v, res),
    unit,
  };

  if (!plan.complete || !plan.removal) {
    return (
      <div className="panel p-4 text-graphite-700">
        <p>
          {plan.held.length > 0 && plan.missing.length === 0
            ? "The plan waits for a weight held on the weigh-in: nothing is worked out from it until it is confirmed as read or retyped."
            : "The plan appears once every part is weighed."}
        </p>
        {plan.error ? <p className="mt-2 text-replace">{plan.error.message}</p> : null}
        {plan.held.length > 0 ? (
          <p className="mt-2 text-sm">
            <a className="underline" href={`/jobs/${jobId}/weigh`}>
              Go to the weigh-in to confirm or retype it
            </a>
          </p>
        ) : null}
        {plan.missing.length > 0 ? (
          <p className="mt-2 text-sm">
            Missing:{" "}
            {plan.missing
              .slice(0, 12)
              .map((m) => `cyl. ${m.cylinder} ${KIND_LABEL[m.kind].toLowerCase()}`)
              .join(", ")}
            {plan.missing.length > 12 ? ` and ${plan.missing.length - 12} more` : ""}.
          </p>
        ) : null}
      </div>
    );
  }

  const removal = plan.removal;
  const byCylinder = plan.matching === "by-cylinder";
  const kinds = [...new Set(removal.parts.map((p) => p.kind))].filter((k) => k !== "bearing");
  const light = removal.parts.filter((p) => p.status === "light");
  const reselect = [
    ...removal.parts
      .filter((p) => p.status === "reselect")
      .map((p) => ({
        key: `${p.cylinder}:${p.kind}`,
        text: `Cylinder ${p.cylinder} ${KIND_LABEL[p.kind].toLowerCase()}: ${show.derived(p.excess ?? "0")} ${unit} over the target — ${HOW_TO_RESELECT[p.kind] ?? "re-select it"}.`,
      })),
    ...removal.warnings
      .filter((w) => w.code === "assembly-reselect")
      .map((w) => ({ key: `assembly-${w.cylinder}`, text: w.message })),
  ];
  const reweighed = new Map(
    workshop.weights
      .filter((w) => w.phase === "final")
      .map((w) => [`${w.cylinder}:${w.kind}`, w.readings]),
  );
  const finishedByKey = new Map(plan.finished?.parts.map((p) => [`${p.cylinder}:${p.kind}`, p]));

  return (
    <div className="space-y-6">
      <OverMachinedBanner plan={plan} show={show} />

      {light.length > 0 ? (
        <section
          className="rounded-md border-2 border-replace bg-red-50 p-4"
          data-testid="replace-parts"
        >
          <h2 className="font-semibold text-replace">Parts to replace or add weight to</h2>
          <ul className="mt-1 list-disc pl-5 text-sm">
            {light.map((p) => (
              <li key={`${p.cylinder}:${p.kind}`}>
                Cylinder {p.cylinder} {KIND_LABEL[p.kind].toLowerCase()}: {show.weighed(p.measured)}{" "}
                {unit}, below the target of{" "}
                {show.derived(removal.targets[p.kind as keyof typeof removal.targets] ?? "0")}{" "}
                {unit}. Metal cannot be put back by machining.
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {reselect.length > 0 ? (
        <section
          className="rounded-md border-2 border-replace bg-red-50 p-4"
          data-testid="reselect-parts"
        >
          <h2 className="font-semibold text-replace">Parts to re-select or replace</h2>
          <ul className="mt-1 list-disc pl-5 text-sm">
            {reselect.map((r) => (
              <li key={r.key}>{r.text}</li>
            ))}
          </ul>
        </section>
      ) : null}

      <div className="space-y-1 text-sm text-graphite-600">
        <p>
          {byCylinder
            ? "Matched by cylinder: each reciprocating assembly (piston, pin, retainers, rings and small end) is brought to the lightest, taking metal off the piston first (never below the lightest piston), then off the small-end pad (never below the lightest small end). Big ends are matched end to end."
            : "Matched part by part: each kind is brought to its own lightest (or the target set). Rings, wrist pins and retainers are matched by choice, never machined."}{" "}
          Tolerance: the finished set within {removal.tolerance} {unit}. Weighed figures at the
          scale resolution ({res} {unit}), worked-out figures to one decimal more.
        </p>
        <p data-testid="total-removed">
          In all the plan takes off{" "}
          <strong className="font-mono">
            {show.derived(plan.totalRemoved ?? "0")} {unit}
          </strong>
          .
        </p>
        <p className="text-graphite-700">
          Caution: wear eye protection when machining. Take metal off only where the piston and rod
          makers allow, and no more than their minimum weights permit; their figures come first.
        </p>
      </div>

      {byCylinder ? <AssemblyTable plan={plan} show={show} /> : null}

      {kinds.map((kind) => (
        <KindTable
          key={kind}
          jobId={jobId}
          kind={kind}
          plan={plan}
          workshop={workshop}
          canEdit={canEdit}
          reweighed={reweighed}
          finishedByKey={finishedByKey}
          show={show}
        />
      ))}

      <Pairing
        jobId={jobId}
        workshop={workshop}
        canEdit={canEdit}
        show={show}
        timeZone={timeZone}
      />

      {removal.warnings.length > 0 ? (
        <section className="panel p-4">
          <h2 className="mb-1 font-semibold">Worth a second look</h2>
          <ul className="list-disc pl-5 text-sm text-graphite-700">
            {removal.warnings.map((w, i) => (
              <li key={i}>{w.message}</li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}

/** Parts machined under their target after the re-weigh, and the three ways out. */
function OverMachinedBanner({ plan, show }: { plan: WorkshopPlan; show: Show }) {
  if (plan.overMachined.length === 0) return null;
  const name = (kind: PartKind | "assembly") =>
    kind === "assembly" ? "reciprocating assembly" : KIND_LABEL[kind].toLowerCase();
  const plural = (kind: PartKind | "assembly") =>
    kind === "assembly" ? "assemblies" : `${KIND_LABEL[kind].toLowerCase()}s`;
  return (
    <section
      className="rounded-md border-2 border-replace bg-red-50 p-4"
      role="alert"
      data-testid="over-machined"
    >
      <h2 className="font-semibold text-replace">Over-machined: now under the target</h2>
      <ul className="mt-1 list-disc pl-5 text-sm">
        {plan.overMachined.map((o) => (
          <li key={`${o.cylinder}:${o.kind}`}>
            Cylinder {o.cylinder} {name(o.kind)} is {show.derived(o.short)} {show.unit} light.
          </li>
        ))}
      </ul>
      <p className="mt-2 text-sm">
        Either replace the part with a heavier one, add weight where its maker allows, or re-target
        the set to it:
      </p>
      <ul className="mt-1 list-disc pl-5 text-sm">
        {plan.retarget.map((r) => (
          <li key={r.kind}>
            re-targeting the {plural(r.kind)} to {show.derived(r.target)} {show.unit} means taking{" "}
            <strong className="font-mono">
              {show.derived(r.extra)} {show.unit}
            </strong>{" "}
            off the rest of them, from where they stand now.
          </li>
        ))}
      </ul>
    </section>
  );
}

/** Matching by cylinder: each reciprocating assembly, what comes off it and where it stands. */
function AssemblyTable({ plan, show }: { plan: WorkshopPlan; show: Show }) {
  const removal = plan.removal!;
  const cut = (cylinder: number, kind: PartKind) =>
    removal.parts.find((p) => p.cylinder === cylinder && p.kind === kind)?.remove ?? "0";
  return (
    <section className="panel" aria-labelledby="assemblies-title">
      <div className="border-b border-graphite-200 px-4 py-3">
        <h2 id="assemblies-title" className="text-lg font-semibold">
          Reciprocating assemblies
        </h2>
        <p className="text-sm text-graphite-600">
          Target: the lightest assembly,{" "}
          <span className="font-mono">
            {show.derived(removal.assemblyTarget ?? "0")} {show.unit}
          </span>
          .
        </p>
      </div>
      <div className="overflow-x-auto p-4">
        <table className="w-full text-sm">
          <thead className="text-left text-graphite-500">
            <tr>
              <th className="py-1 pr-3 font-semibold">Cyl.</th>
              <th className="py-1 pr-3 font-semibold">Weighed</th>
              <th className="py-1 pr-3 font-semibold">Off the piston</th>
              <th className="py-1 pr-3 font-semibold">Off the small end</th>
              <th className="py-1 pr-3 font-semibold">Finished</th>
              <th className="py-1 font-semibold">State</th>
            </tr>
          </thead>
          <tbody className="font-mono">
            {removal.cylinders.map((c) => {
              const a = c.assembly;
              if (!a) return null;
              const progress = plan.assemblies[c.number];
              const piston = cut(c.number, "piston");
              const small = cut(c.number, "smallEnd");
              return (
                <tr key={c.number} className="border-t border-graphite-100">
                  <td className="py-1.5 pr-3">{c.number}</td>
                  <td className="py-1.5 pr-3">{show.derived(a.measured)}</td>
                  <td className="py-1.5 pr-3">{piston === "0" ? "—" : show.derived(piston)}</td>
                  <td className="py-1.5 pr-3">{small === "0" ? "—" : show.derived(small)}</td>
                  <td className="py-1.5 pr-3">{show.derived(a.final)}</td>
                  <td className="py-1.5 font-sans">
                    {progress ? (
                      <ProgressTag progress={progress} show={show.derived} />
                    ) : (
                      <StatusTag status={a.status} />
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </section>
  );
}

function KindTable({
  jobId,
  kind,
  plan,
  workshop,
  canEdit,
  reweighed,
  finishedByKey,
  show,
}: {
  jobId: number;
  kind: PartKind;
  plan: WorkshopPlan;
  workshop: Workshop;
  canEdit: boolean;
  reweighed: Map<string, string[]>;
  finishedByKey: Map<string, PartResult>;
  show: Show;
}) {
  const removal = plan.removal!;
  const unit = show.unit;
  const parts = removal.parts.filter((p) => p.kind === kind);
  const target = removal.targets[kind as keyof typeof removal.targets];
  const setTarget = workshop.targets.find((t) => t.kind === kind);
  const inAssembly = plan.matching === "by-cylinder" && kind !== "bigEnd";
  const machined = HOW_TO_REMOVE[kind] !== undefined;
  const weighed = (p: PartResult) =>
    p.readings && p.readings.length > 1 ? show.derived(p.measured) : show.weighed(p.measured);
  return (
    <section className="panel" aria-labelledby={`kind-${kind}`}>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-graphite-200 px-4 py-3">
        <div>
          <h2 id={`kind-${kind}`} className="text-lg font-semibold">
            {KIND_LABEL[kind]}
          </h2>
          <p className="text-xs text-graphite-600">
            {machined
              ? `Metal comes off here: ${HOW_TO_REMOVE[kind]}.`
              : `Never machined: ${HOW_TO_RESELECT[kind] ?? "weighed only"}.`}
          </p>
        </div>
        {inAssembly ? (
          <p className="text-sm text-graphite-600">Matched as part of each cylinder’s assembly.</p>
        ) : (
          <TargetEditor
            jobId={jobId}
            kind={kind}
            current={target ?? null}
            shown={target ? show.derived(target) : ""}
            isSet={Boolean(setTarget?.target)}
            version={setTarget?.version ?? 0}
            canEdit={canEdit}
            unit={unit}
          />
        )}
      </div>
      <div className="grid gap-4 p-4 lg:grid-cols-[1fr_22rem]">
        <div className="overflow-x-auto">
          <table className="w-full text-sm">
            <thead className="text-left text-graphite-500">
              <tr>
                <th className="py-1 pr-3 font-semibold">Cyl.</th>
                <th className="py-1 pr-3 font-semibold">Weighed</th>
                {machined ? <th className="py-1 pr-3 font-semibold">Take off</th> : null}
                <th className="py-1 pr-3 font-semibold">Finished</th>
                <th className="py-1 pr-3 font-semibold">Re-weighed</th>
                <th className="py-1 font-semibold">State</th>
              </tr>
            </thead>
            <tbody className="font-mono">
              {parts.map((p) => {
                const key = `${p.cylinder}:${p.kind}`;
                const after = reweighed.get(key);
                const progress = plan.progress[key];
                return (
                  <tr key={key} className="border-t border-graphite-100">
                    <td className="py-1.5 pr-3">{p.cylinder}</td>
                    <td className="py-1.5 pr-3">
                      {weighed(p)}
                      {p.readings && p.readings.length > 1 ? (
                        <span className="ml-1 text-xs text-graphite-500">
                          spread {show.derived(p.spread ?? "0")}
                        </span>
                      ) : null}
                    </td>
                    {machined ? (
                      <td className="py-1.5 pr-3 text-lg font-semibold">
                        {p.status === "remove" ? show.derived(p.remove) : "—"}
                      </td>
                    ) : null}
                    <td className="py-1.5 pr-3">
                      {p.status === "remove" ? show.derived(p.final) : weighed(p)}
                    </td>
                    <td className="py-1.5 pr-3">{after ? after.join(" ") : "—"}</td>
                    <td className="py-1.5 font-sans">
                      {progress ? (
                        <ProgressTag progress={progress} show={show.derived} />
                      ) : inAssembly && p.status === "ok" ? (
                        <span className="text-xs text-graphite-500">as weighed</span>
                      ) : (
                        <StatusTag status={p.status} />
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <PartChart
          parts={parts}
          finished={parts.map((p) => finishedByKey.get(`${p.cylinder}:${p.kind}`))}
          target={target ?? "0"}
          tolerance={removal.tolerance}
          unit={unit}
        />
      </div>
    </section>
  );
}

function TargetEditor(props: {
  jobId: number;
  kind: PartKind;
  current: string | null;
  /** The current target as the display rule shows it (a target: one decimal past the scale). */
  shown: string;
  isSet: boolean;
  version: number;
  canEdit: boolean;
  unit: string;
}) {
  const update = useUpdateWorkshop(props.jobId);
  const [value, setValue] = useState(props.isSet ? (props.current ?? "") : "");
  const [message, setMessage] = useState<string | null>(null);
  const save = useMutation({
    mutationFn: (target: string | null) =>
      apiFetch<{
        plan: WorkshopPlan;
        target: { kind: PartKind; target: string | null; version: number };
      }>(`/api/jobs/${props.jobId}/targets`, {
        method: "PUT",
        body: { kind: props.kind, target, version: props.version },
      }),
    onSuccess: (r) => {
      update((w) => ({
        ...w,
        plan: r.plan,
        targets: [...w.targets.filter((t) => t.kind !== props.kind), r.target],
      }));
      setMessage("saved");
    },
    onMutate: () => setMessage(null),
    onError: (e) =>
      setMessage(
        isStaleWrite(e)
          ? null
          : e instanceof ApiError
            ? (Object.values(e.fields)[0] ?? e.message)
            : "not saved",
      ),
  });
  const latest = useReloadWorkshop(props.jobId);
  async function loadLatest() {
    const fresh = await latest.reload();
    if (!fresh) return;
    save.reset();
    setValue(fresh.targets.find((t) => t.kind === props.kind)?.target ?? "");
  }
  if (!props.canEdit) {
    return (
      <p className="text-sm">
        Target <span className="font-mono font-semibold">{props.shown}</span> {props.unit}
      </p>
    );
  }
  return (
    <form
      className="flex flex-wrap items-center gap-2 text-sm"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(value.trim() === "" ? null : value.trim());
      }}
    >
      <label htmlFor={`target-${props.kind}`}>
        Target ({props.isSet ? "set by hand" : "the lightest"}) {props.unit}
      </label>
      <input
        id={`target-${props.kind}`}
        value={value}
        placeholder={props.shown}
        onChange={(e) => setValue(e.target.value)}
        inputMode="decimal"
        className="w-24 rounded border border-graphite-300 px-2 py-1 font-mono"
      />
      <button type="submit" className="btn-secondary py-1" disabled={save.isPending}>
        {value.trim() === "" ? "Use lightest" : "Set target"}
      </button>
      <span aria-live="polite" className="text-xs text-graphite-500">
        {message}
      </span>
      {isStaleWrite(save.error) ? (
        <ChangedElsewhere
          inline
          what={`the ${KIND_LABEL[props.kind].toLowerCase()} target`}
          error={save.error}
          onReload={() => void loadLatest()}
          loading={latest.loading}
        />
      ) : null}
    </form>
  );
}

/**
 * Which piston rides on which rod: offered only when matching by cylinder (part by part a
 * pairing changes nothing taken off) and before machining; applied after a confirmation that
 * names every move, recorded in the job's changes and undoable one step back.
 */
function Pairing({
  jobId,
  workshop,
  canEdit,
  show,
  timeZone,
}: {
  jobId: number;
  workshop: Workshop;
  canEdit: boolean;
  show: Show;
  timeZone: string;
}) {
  const update = useUpdateWorkshop(jobId);
  const [confirming, setConfirming] = useState(false);
  const { plan, lastPairing } = workshop;
  const pairing = plan.pairing;
  const apply = useMutation({
    mutationFn: () =>
      apiFetch<Workshop>(`/api/jobs/${jobId}/pairing`, {
        method: "POST",
        body: {
          assignment: pairing!.assignment.map((a) => ({
            rodCylinder: a.rodCylinder,
            pistonFromCylinder: a.pistonFromCylinder,
          })),
          lastPairingId: lastPairing?.id ?? 0,
        },
      }),
    onSuccess: (w) => {
      setConfirming(false);
      update(() => w);
    },
  });
  const undo = useMutation({
    mutationFn: () =>
      apiFetch<Workshop>(`/api/jobs/${jobId}/pairing/undo`, {
        method: "POST",
        body: { pairingId: lastPairing!.id },
      }),
    onSuccess: (w) => update(() => w),
  });
  const failure = apply.error ?? undo.error;
  const latest = useReloadWorkshop(jobId);
  const fmt = (v: string) => `${show.derived(v)} ${show.unit}`;
  const canUndo = canEdit && lastPairing?.action === "pair";

  return (
    <section className="panel p-4" aria-labelledby="pairing-title" data-testid="pairing">
      <h2 id="pairing-title" className="text-lg font-semibold">
        Piston-to-rod pairing
      </h2>
      {plan.matching === "by-part" ? (
        <p className="text-sm text-graphite-600">
          Matched part by part, every kind is brought to its own lightest, so which piston rides on
          which rod changes nothing taken off. To pair pistons with rods, match by cylinder in the
          job settings.
        </p>
      ) : plan.reweighed > 0 ? (
        <p className="text-sm text-graphite-600">
          Parts have been re-weighed after machining: pistons are paired with rods before machining
          starts, so no pairing is offered now.
        </p>
      ) : !pairing || !pairing.changed ? (
        <p className="text-sm text-graphite-600">
          The pistons already sit on the rods that need the least metal taken off.
        </p>
      ) : (
        <>
          <p className="text-sm text-graphite-700">
            With the pistons on these rods the plan takes off{" "}
            <strong className="font-mono">{fmt(pairing.removedSuggested)}</strong> instead of{" "}
            <span className="font-mono">{fmt(pairing.removedNumbered)}</span>
            {pairing.saved !== "0" && !pairing.saved.startsWith("-") ? (
              <>
                : <strong className="font-mono">{fmt(pairing.saved)}</strong> less metal
              </>
            ) : null}
            {pairing.unfixedSuggested !== pairing.unfixedNumbered ? (
              <>
                , and leaves {fmt(pairing.unfixedSuggested)} that machining cannot fix instead of{" "}
                {fmt(pairing.unfixedNumbered)}
              </>
            ) : null}
            . Both figures come from this plan, worked out for each numbering.
          </p>
          <ul className="mt-2 grid gap-1 font-mono text-sm sm:grid-cols-2 lg:grid-cols-4">
            {pairing.moves.map((m) => (
              <li key={m.rodCylinder}>
                piston {m.pistonFromCylinder} → cylinder {m.rodCylinder}
              </li>
            ))}
          </ul>
          {canEdit && !confirming ? (
            <button type="button" className="btn-primary mt-3" onClick={() => setConfirming(true)}>
              Apply this pairing…
            </button>
          ) : null}
          {canEdit && confirming ? (
            <div
              role="alertdialog"
              aria-labelledby="pairing-confirm-title"
              aria-describedby="pairing-confirm-text"
              className="mt-3 rounded-md border-2 border-machine bg-amber-50 p-3"
            >
              <h3 id="pairing-confirm-title" className="font-semibold">
                Move these piston assemblies?
              </h3>
              <p id="pairing-confirm-text" className="text-sm">
                Each piston moves with its wrist pin, retainers and rings, and its weights move with
                it: {describePairingMoves(pairing.moves)}. The move is kept in the job’s changes and
                can be undone.
              </p>
              <div className="mt-2 flex gap-2">
                <button
                  type="button"
                  className="btn-primary"
                  onClick={() => apply.mutate()}
                  disabled={apply.isPending}
                >
                  {apply.isPending ? "Moving…" : "Move them"}
                </button>
                <button
                  type="button"
                  className="btn-secondary"
                  onClick={() => setConfirming(false)}
                >
                  Cancel
                </button>
              </div>
            </div>
          ) : null}
        </>
      )}
      {canUndo ? (
        <div className="mt-3 text-sm" data-testid="pairing-undo">
          <p>
            Last pairing applied {shopDateTime(lastPairing.at, timeZone)}:{" "}
            {describePairingMoves(lastPairing.moves)}.
          </p>
          <button
            type="button"
            className="btn-secondary mt-1"
            onClick={() => undo.mutate()}
            disabled={undo.isPending}
          >
            {undo.isPending ? "Moving back…" : "Undo this pairing"}
          </button>
        </div>
      ) : null}
      {isStaleWrite(failure) ? (
        <div className="mt-2">
          <ChangedElsewhere
            what="the piston-to-rod pairing"
            onReload={() =>
              void latest.reload().then((w) => {
                if (!w) return;
                apply.reset();
                undo.reset();
              })
            }
            loading={latest.loading}
          />
        </div>
      ) : failure ? (
        <p className="mt-2 text-sm text-replace">{failure.message}</p>
      ) : null}
    </section>
  );
}
