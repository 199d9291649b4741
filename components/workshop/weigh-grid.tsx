"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import Decimal from "decimal.js";
import { type KeyboardEvent, useCallback, useEffect, useMemo, useRef, useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { PartKind, WeighPhase } from "@/db/schema";
import type { PartWeight } from "@/db/weights";
import { ApiError, apiFetch } from "@/lib/api-client";
import { formatDerivedMass } from "@/lib/balance";
import { readingsTextSchema, readingsTextSchemaFor } from "@/lib/validation/readings";
import { checkPartWeight } from "@/lib/workshop/outliers";
import type { WorkshopPlan } from "@/lib/workshop/plan";
import type { Workshop } from "@/lib/workshop/load";
import { KIND_LABEL, WEIGH_COLUMNS } from "./part-kinds";
import { useMarkWorkshopStale, useUpdateWorkshop, useWorkshop } from "./use-workshop";

type CellState = {
  state: "saving" | "saved" | "error" | "conflict" | "held" | "queued";
  message?: string;
  /** For "conflict": what is saved now (unknown until the latest arrives) and what was typed. */
  theirs?: string;
  mine?: string;
  /** For "conflict": the refusal, for what its body says is current. */
  refusal?: unknown;
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

/**
 * A save the server did not receive (the network dropped): kept on this PC and sent again, with
 * the version it was based on, so a part changed elsewhere meanwhile still gets the conflict view.
 */
export interface QueuedSave {
  name: string;
  phase: WeighPhase;
  cylinder: number;
  kind: PartKind;
  readings: string[];
  version: number;
  confirm?: boolean;
  /** Set when it came back refused while another weighing was on screen: shown there. */
  problem?: string;
}

const fieldName = (cylinder: number, kind: PartKind) => `c${cylinder}_${kind}`;
const queueId = (phase: WeighPhase, name: string) => `${phase}:${name}`;

/** Where the unsaved weights of one job and weighing are kept between visits (localStorage). */
const queueStorageKey = (jobId: number, phase: WeighPhase) =>
  `counterpoise:weigh-queue:${jobId}:${phase}`;
const PHASES: WeighPhase[] = ["initial", "final"];
/** Marks the extra history entry that makes the browser's Back ask first (see WeighGrid). */
const BACK_GUARD = "counterpoiseWeighBackGuard";

function readQueue(jobId: number): Record<string, QueuedSave> {
  const queue: Record<string, QueuedSave> = {};
  for (const phase of PHASES) {
    try {
      const raw = window.localStorage.getItem(queueStorageKey(jobId, phase));
      const entries = raw ? (JSON.parse(raw) as QueuedSave[]) : [];
      for (const e of Array.isArray(entries) ? entries : [])
        if (e && e.phase === phase && Array.isArray(e.readings)) queue[queueId(phase, e.name)] = e;
    } catch {
      // Unreadable storage (private window, full disk): nothing kept to restore.
    }
  }
  return queue;
}

function writeQueue(jobId: number, queue: Record<string, QueuedSave>) {
  for (const phase of PHASES) {
    const entries = Object.values(queue).filter((e) => e.phase === phase);
    try {
      if (entries.length === 0) window.localStorage.removeItem(queueStorageKey(jobId, phase));
      else window.localStorage.setItem(queueStorageKey(jobId, phase), JSON.stringify(entries));
    } catch {
      // Storage refused: the queue still lives in this page and the leave warning still asks.
    }
  }
}

/** The request never reached the server, or a gateway said it was away: worth trying again. */
function isNetworkFailure(error: unknown) {
  if (!(error instanceof ApiError)) return true;
  return [0, 408, 502, 503, 504].includes(error.status);
}

/**
 * The parts the re-weigh walks: those the plan has machined (to take metal off, done, still to
 * take off, over-machined). Empty when there is no plan yet: then every part is walked.
 */
function machinedNames(plan: WorkshopPlan): Set<string> {
  const names = new Set<string>();
  for (const part of plan.removal?.parts ?? [])
    if (part.status === "remove") names.add(fieldName(part.cylinder, part.kind));
  for (const [key, progress] of Object.entries(plan.progress ?? {})) {
    if (progress.state === "reselect") continue;
    const [cylinder, kind] = key.split(":");
    names.add(fieldName(Number(cylinder), kind as PartKind));
  }
  return names;
}

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
 *
 * On the shop floor: the grid opens in the first part still to weigh; after machining, Enter walks
 * only the parts the plan machined. A save the network drops is kept on this PC (localStorage, by
 * job and weighing, with the version it was based on) and sent again with a growing wait, the
 * count of unsaved weights on screen; leaving with any asks first. At phone width (480 px and
 * under: Tailwind's `max-[481px]` is `width < 481px`) each cylinder is a card, with the same boxes
 * in the same order.
 */
export function WeighGrid({
  jobId,
  initial,
  canEdit,
  retryBaseMs = 2000,
}: {
  jobId: number;
  initial: Workshop;
  canEdit: boolean;
  /** The first wait before a save the network dropped is sent again; it doubles up to 30 s. */
  retryBaseMs?: number;
}) {
  const { data } = useWorkshop(jobId, initial);
  const workshop = data ?? initial;
  const update = useUpdateWorkshop(jobId);
  const markStale = useMarkWorkshopStale(jobId);
  const cylinders = Array.from({ length: workshop.job.spec.cylinders ?? 0 }, (_, i) => i + 1);
  const [phase, setPhase] = useState<WeighPhase>("initial");
  // The phase on screen, for answers that arrive after the machinist switched.
  const phaseRef = useRef<WeighPhase>("initial");
  const [order, setOrder] = useState<Order>(workshop.job.spec.benchOrder);
  const [cells, setCells] = useState<Record<string, CellState>>({});
  const [announce, setAnnounce] = useState("");
  // Set once the grid is live in the browser: typing before that would be lost to hydration.
  const [ready, setReady] = useState(false);
  const inputs = useRef<Record<string, HTMLInputElement | null>>({});
  // What the server holds for each cell of this phase: read synchronously between Enter and blur.
  const saved = useRef<Record<string, { text: string; version: number }>>({});
  // Readings on their way to the server, by phase and cell.
  const inflight = useRef<Record<string, string>>({});
  // Readings the server held: the blur that follows moving to "Keep" must not send them again.
  const held = useRef<Record<string, string>>({});
  const keepButtons = useRef<Record<string, HTMLButtonElement | null>>({});
  // Saves the network dropped, by phase and cell; mirrored in localStorage.
  const [queue, setQueueState] = useState<Record<string, QueuedSave>>({});
  const queueRef = useRef<Record<string, QueuedSave>>({});
  const attempts = useRef(0);
  const retryTimer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const draining = useRef(false);
  const [nextTry, setNextTry] = useState<number | null>(null);
  // Back asks while weights are unsaved: the extra history entry is in place; the machinist said leave.
  const backGuard = useRef(false);
  const leaving = useRef(false);
  function pushBackGuard() {
    const state = (window.history.state as Record<string, unknown> | null) ?? {};
    window.history.pushState({ ...state, [BACK_GUARD]: true }, "", window.location.href);
    backGuard.current = true;
  }
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
        // A weight typed here but not saved yet shows as typed.
        const queued = queueRef.current[queueId(p, name)];
        if (queued) values[name] = queued.readings.join(" ");
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

  const machined = useMemo(() => machinedNames(workshop.plan), [workshop.plan]);
  const fullOrder = useMemo(() => {
    const kinds = WEIGH_COLUMNS.map((c) => c.kind);
    return order === "by-kind"
      ? kinds.flatMap((k) => cylinders.map((c) => fieldName(c, k)))
      : cylinders.flatMap((c) => kinds.map((k) => fieldName(c, k)));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [order, cylinders.length]);
  /** Where Enter goes: every part on the first weigh; after machining, the machined parts only. */
  const sequenceFor = useCallback(
    (p: WeighPhase) => {
      if (p !== "final") return fullOrder;
      const walk = fullOrder.filter((n) => machined.has(n));
      return walk.length > 0 ? walk : fullOrder;
    },
    [fullOrder, machined],
  );
  const sequence = useMemo(() => sequenceFor(phase), [sequenceFor, phase]);

  const save = useMutation({
    mutationFn: (body: {
      cylinder: number;
      kind: PartKind;
      phase: WeighPhase;
      readings: string[];
      version: number;
      confirmOutlier?: true;
    }) =>
      apiFetch<{ weight: PartWeight | null; plan: WorkshopPlan }>(`/api/jobs/${jobId}/weights`, {
        method: "PUT",
        body,
      }),
  });

  const versionOf = (cylinder: number, kind: PartKind) =>
    saved.current[fieldName(cylinder, kind)]?.version ?? 0;

  function setQueue(change: (q: Record<string, QueuedSave>) => Record<string, QueuedSave>) {
    const next = change(queueRef.current);
    queueRef.current = next;
    setQueueState(next);
    writeQueue(jobId, next);
  }
  const sameSave = (a: QueuedSave | undefined, b: QueuedSave) =>
    a !== undefined && a.readings.join(" ") === b.readings.join(" ") && a.version === b.version;
  /** Takes a save off the queue once answered, unless a newer one for the part replaced it. */
  function dequeue(entry: QueuedSave) {
    const id = queueId(entry.phase, entry.name);
    if (!sameSave(queueRef.current[id], entry)) return;
    setQueue((q) => {
      const rest = { ...q };
      delete rest[id];
      return rest;
    });
  }
  function enqueue(entry: QueuedSave) {
    setQueue((q) => ({ ...q, [queueId(entry.phase, entry.name)]: entry }));
  }

  function scheduleRetry() {
    if (retryTimer.current) return;
    attempts.current += 1;
    const delay = Math.min(30_000, retryBaseMs * 2 ** (attempts.current - 1));
    setNextTry(Math.max(1, Math.round(delay / 1000)));
    retryTimer.current = setTimeout(() => {
      retryTimer.current = null;
      void drain();
    }, delay);
  }

  /** Sends the queued saves one at a time; stops at the first the network drops again. */
  async function drain() {
    if (retryTimer.current) clearTimeout(retryTimer.current);
    retryTimer.current = null;
    if (draining.current) return;
    draining.current = true;
    setNextTry(null);
    try {
      for (const [id, entry] of Object.entries(queueRef.current)) {
        if (!queueRef.current[id] || inflight.current[id] !== undefined) continue;
        if (entry.problem && entry.phase !== phaseRef.current) continue;
        const { problem: _problem, ...fresh } = entry;
        const ok = await send(fresh);
        if (!ok && retryTimer.current) return; // still unreachable: the next try is set
      }
      attempts.current = 0;
    } finally {
      draining.current = false;
    }
  }

  /**
   * One save to the server and what its answer means for the cell. A save the network drops is
   * queued (kept on this PC) and tried again; every other answer is shown on the cell.
   */
  async function send(entry: QueuedSave, options: { focusHeld?: boolean } = {}) {
    const { name, cylinder, kind } = entry;
    const id = queueId(entry.phase, name);
    const joined = entry.readings.join(" ");
    const here = () => entry.phase === phaseRef.current;
    const text = here() ? (form.getValues(name) ?? joined) : joined;
    inflight.current[id] = joined;
    if (here()) setCells((s) => ({ ...s, [name]: { state: "saving" } }));
    try {
      const result = await save.mutateAsync({
        cylinder,
        kind,
        phase: entry.phase,
        readings: entry.readings,
        version: entry.version,
        ...(entry.confirm ? { confirmOutlier: true as const } : {}),
      });
      dequeue(entry);
      if (here()) saved.current[name] = { text: joined, version: result.weight?.version ?? 0 };
      update((w) => ({
        ...w,
        plan: result.plan,
        weights: [
          ...w.weights.filter(
            (x) => !(x.phase === entry.phase && x.cylinder === cylinder && x.kind === kind),
          ),
          ...(result.weight ? [result.weight] : []),
        ],
      }));
      // The answer's plan leaves out the pairing search: the plan page fetches it when opened.
      if (result.plan.pairingDeferred) markStale();
      if (here()) setCells((s) => ({ ...s, [name]: { state: "saved" } }));
      setAnnounce(`Cylinder ${cylinder} ${kind}: saved`);
      // The server answers again: send what the network dropped before.
      attempts.current = 0;
      if (Object.keys(queueRef.current).length > 0 && !draining.current)
        setTimeout(() => void drain(), 0);
      return true;
    } catch (error) {
      if (isNetworkFailure(error)) {
        enqueue(entry);
        if (here())
          setCells((s) => ({
            ...s,
            [name]: {
              state: "queued",
              message:
                "Not saved yet: the server could not be reached. Kept on this PC, sent again shortly.",
            },
          }));
        setAnnounce(`Cylinder ${cylinder} ${kind}: not saved yet, kept on this PC`);
        scheduleRetry();
        return false;
      }
      if (!here()) {
        // Refused while the other weighing is on screen: kept, and shown when it is opened.
        const message = error instanceof Error ? error.message : "Not saved.";
        if (queueRef.current[id]) enqueue({ ...entry, problem: message });
        return false;
      }
      dequeue(entry);
      if (isStaleWrite(error)) {
        setCells((s) => ({
          ...s,
          [name]: { state: "conflict", mine: text, refusal: error },
        }));
        setAnnounce(`Cylinder ${cylinder} ${kind}: changed elsewhere, not saved`);
        const theirs = await fetchTheirs(entry.phase, cylinder, kind);
        if (theirs === null) return false;
        if (theirs === joined) {
          // The same readings reached the server before (a save answered after the page left).
          setCells((s) => ({ ...s, [name]: { state: "saved" } }));
          return true;
        }
        setCells((s) => ({
          ...s,
          [name]: { state: "conflict", theirs, mine: text, refusal: error },
        }));
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
          : "Not saved.";
      setCells((s) => ({ ...s, [name]: { state: "error", message } }));
      setAnnounce(`Cylinder ${cylinder} ${kind}: not saved`);
      return false;
    } finally {
      delete inflight.current[id];
    }
  }

  /**
   * The latest bench record after a stale write: shared with every bench screen, and what is
   * saved now for the part (null when the server could not be reached).
   */
  async function fetchTheirs(p: WeighPhase, cylinder: number, kind: PartKind) {
    const fresh = await apiFetch<Workshop>(`/api/jobs/${jobId}/workshop`).catch(() => null);
    if (!fresh) return null;
    update(() => fresh);
    const theirs = cellText(fresh.weights, p, cylinder, kind);
    const current = fresh.weights.find(
      (w) => w.phase === p && w.cylinder === cylinder && w.kind === kind,
    );
    if (p === phaseRef.current)
      saved.current[fieldName(cylinder, kind)] = { text: theirs, version: current?.version ?? 0 };
    return theirs;
  }

  async function commit(cylinder: number, kind: PartKind, options: CommitOptions = {}) {
    const name = fieldName(cylinder, kind);
    const id = queueId(phase, name);
    const text = form.getValues(name) ?? "";
    const parsed = readingRule.safeParse(text);
    if (!parsed.success) {
      await form.trigger(name);
      return false;
    }
    const readings = parsed.data;
    const joined = readings.join(" ");
    const forced = options.version !== undefined || options.confirm === true;
    const queued = queueRef.current[id];
    if (!forced && joined === saved.current[name]?.text) {
      // Typed back to what the server holds: nothing is left to send.
      if (queued) {
        dequeue(queued);
        setCells((s) => ({ ...s, [name]: { state: "saved" } }));
      }
      return true;
    }
    // Enter moves on at once and the blur saves; a second call for the same text is not a new write.
    if (!forced && joined === inflight.current[id]) return true;
    // Already queued as it stands: the retry sends it.
    if (!forced && queued && queued.readings.join(" ") === joined) return false;
    // Held readings wait for "Keep" or a retype; leaving the box does not send them again.
    if (!forced && joined === held.current[name]) return false;
    delete held.current[name];
    return send(
      {
        name,
        phase,
        cylinder,
        kind,
        readings,
        version: options.version ?? versionOf(cylinder, kind),
        ...(options.confirm ? { confirm: true } : {}),
      },
      { focusHeld: options.focusHeld },
    );
  }

  /** The next part Enter goes to (or Shift+Enter back to), from any cell, walked or not. */
  const nextAfter = (name: string, back = false) => {
    const at = fullOrder.indexOf(name);
    const walk = sequence.filter((n) =>
      back ? fullOrder.indexOf(n) < at : fullOrder.indexOf(n) > at,
    );
    return back ? walk.at(-1) : walk[0];
  };

  /** The cell to start in: the first part still to weigh (re-weigh) in Enter's order. */
  function firstCell(p: WeighPhase) {
    const walk = sequenceFor(p);
    const missing = new Set(workshop.plan.missing.map((m) => fieldName(m.cylinder, m.kind)));
    const unweighed = (n: string) => !saved.current[n]?.text;
    return (
      (p === "initial" ? walk.find((n) => missing.has(n) && unweighed(n)) : undefined) ??
      walk.find(unweighed) ??
      walk[0]
    );
  }

  /** Cells typed into but neither saved, on their way, nor queued (by name, this phase). */
  function dirtyNames() {
    return fullOrder.filter((name) => {
      const parsed = readingRule.safeParse(form.getValues(name) ?? "");
      if (!parsed.success) return (form.getValues(name) ?? "") !== saved.current[name]?.text;
      const joined = parsed.data.join(" ");
      const id = queueId(phaseRef.current, name);
      return (
        joined !== saved.current[name]?.text &&
        joined !== inflight.current[id] &&
        joined !== queueRef.current[id]?.readings.join(" ")
      );
    });
  }

  // Restore what the network dropped before a reload, start in the first part to weigh, and
  // send the queue again whenever the browser says it is back online.
  useEffect(() => {
    setReady(true);
    const restored = readQueue(jobId);
    if (Object.keys(restored).length > 0) {
      queueRef.current = restored;
      setQueueState(restored);
      const here = Object.values(restored).filter((e) => e.phase === phaseRef.current);
      for (const e of here) form.setValue(e.name, e.readings.join(" "));
      setCells((s) => ({
        ...s,
        ...Object.fromEntries(
          here.map((e) => [
            e.name,
            { state: "queued" as const, message: "Not saved yet: sending again." },
          ]),
        ),
      }));
      void drain();
    }
    if (canEdit && (!document.activeElement || document.activeElement === document.body)) {
      const first = firstCell(phaseRef.current);
      if (first) inputs.current[first]?.focus();
    }
    const online = () => void drain();
    window.addEventListener("online", online);
    return () => {
      window.removeEventListener("online", online);
      if (retryTimer.current) clearTimeout(retryTimer.current);
      retryTimer.current = null;
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  /** Typed cells not sent yet go on the queue: kept on this PC, sent with the others. */
  function keepDirtyOnThisPc() {
    const dirty = dirtyNames();
    for (const name of dirty) {
      const parsed = readingRule.safeParse(form.getValues(name) ?? "");
      if (!parsed.success) continue;
      const [, c, kind] = /^c(\d+)_(.+)$/.exec(name) ?? [];
      enqueue({
        name,
        phase: phaseRef.current,
        cylinder: Number(c),
        kind: kind as PartKind,
        readings: parsed.data,
        version: saved.current[name]?.version ?? 0,
      });
    }
    return dirty.length;
  }
  /** Weights not saved yet: queued, or typed and not sent. */
  const unsavedCount = () => Object.keys(queueRef.current).length + dirtyNames().length;
  const leaveQuestion = (count: number) =>
    `${count} weight${count === 1 ? " is" : "s are"} not saved yet. ` +
    "They are kept on this PC and sent when the weigh-in is open again. Leave the weigh-in?";

  // Leaving with weights not saved asks first: a reload or closing the tab (beforeunload), links
  // inside the app (they do not unload the page) and the browser's Back. For Back, an extra
  // history entry for this same page is pushed once something is unsaved: Back then lands on
  // this page's own entry (popstate, seen here before the router), the question is asked, and
  // either the entry is put back (stay) or the grid steps back once more for the machinist.
  useEffect(() => {
    if (!canEdit) return;
    if (!backGuard.current) {
      if ((window.history.state as Record<string, unknown> | null)?.[BACK_GUARD])
        backGuard.current = true;
      else if (unsavedCount() > 0) pushBackGuard();
    }
    const beforeUnload = (event: BeforeUnloadEvent) => {
      const dirty = keepDirtyOnThisPc();
      // Kept now; if the machinist stays, they are sent like any other queued save.
      if (dirty > 0) scheduleRetry();
      if (leaving.current) return; // already asked on Back
      const waiting =
        Object.keys(queueRef.current).length + Object.keys(inflight.current).length + dirty;
      if (waiting === 0) return;
      event.preventDefault();
      // Older browsers ask only when returnValue is set.
      event.returnValue = "";
    };
    const onClick = (event: MouseEvent) => {
      if (event.defaultPrevented || event.button !== 0) return;
      if (event.metaKey || event.ctrlKey || event.shiftKey || event.altKey) return;
      const link = (event.target as Element | null)?.closest?.("a[href]");
      if (!(link instanceof HTMLAnchorElement)) return;
      if (link.target === "_blank" || link.hasAttribute("download")) return;
      const count = unsavedCount();
      if (count === 0) return;
      if (window.confirm(leaveQuestion(count))) return;
      event.preventDefault();
      event.stopPropagation();
    };
    const onPopState = (event: PopStateEvent) => {
      if (!backGuard.current || leaving.current) return;
      // Forward onto the extra entry: nothing to ask.
      if ((event.state as Record<string, unknown> | null)?.[BACK_GUARD]) return;
      // Back from the extra entry to this page's own: the router need not move.
      event.stopImmediatePropagation();
      backGuard.current = false;
      const count = unsavedCount();
      if (count > 0 && !window.confirm(leaveQuestion(count))) {
        pushBackGuard();
        return;
      }
      if (keepDirtyOnThisPc() > 0) void drain();
      leaving.current = true;
      window.setTimeout(() => (leaving.current = false), 2000);
      window.history.back();
    };
    window.addEventListener("beforeunload", beforeUnload);
    window.addEventListener("click", onClick, true);
    // Capture: called before the router's own popstate listener on the window.
    window.addEventListener("popstate", onPopState, true);
    return () => {
      window.removeEventListener("beforeunload", beforeUnload);
      window.removeEventListener("click", onClick, true);
      window.removeEventListener("popstate", onPopState, true);
    };
  });

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
  const queuedSaves = Object.values(queue);

  function switchPhase(p: WeighPhase) {
    phaseRef.current = p;
    setPhase(p);
    held.current = {};
    form.reset(defaults(p));
    // What the network dropped for this weighing shows as such; refusals kept for it are sent again.
    const here = Object.values(queueRef.current).filter((e) => e.phase === p);
    setCells(
      Object.fromEntries(
        here.map((e) => [
          e.name,
          { state: "queued" as const, message: "Not saved yet: sending again." },
        ]),
      ),
    );
    if (here.some((e) => e.problem)) void drain();
    // Into the grid at the first part to weigh (after machining: the first machined part).
    setTimeout(() => {
      const first = firstCell(p);
      if (first && canEdit) inputs.current[first]?.focus();
    }, 0);
  }

  /** "Load the latest" on a conflict: the cell takes what is saved now (fetched if not known). */
  async function keepTheirs(cylinder: number, kind: PartKind) {
    const name = fieldName(cylinder, kind);
    const known = cells[name]?.theirs;
    const theirs = known ?? (await fetchTheirs(phase, cylinder, kind));
    if (theirs === null) {
      setCells((s) => ({
        ...s,
        [name]: { state: "error", message: "The server could not be reached; try again." },
      }));
      return;
    }
    form.setValue(name, theirs);
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

      {phase === "final" && sequence.length < fullOrder.length ? (
        <p className="text-sm text-graphite-600" data-testid="reweigh-walk">
          Enter walks the {sequence.length} part{sequence.length === 1 ? "" : "s"} the plan
          machined; click any other box to re-weigh it too.
        </p>
      ) : null}
      {queuedSaves.length > 0 ? (
        <div
          role="status"
          className="space-y-1 rounded border border-machine/40 bg-amber-50 p-3 text-sm"
          data-testid="unsaved-weights"
        >
          <p>
            <strong>
              {queuedSaves.length} weight{queuedSaves.length === 1 ? "" : "s"} not saved yet
            </strong>
            : the server could not be reached. Kept on this PC and sent again{" "}
            {nextTry !== null ? `in about ${nextTry} s` : "now"}.{" "}
            <button type="button" className="underline" onClick={() => void drain()}>
              Retry now
            </button>
          </p>
          {queuedSaves
            .filter((e) => e.problem)
            .map((e) => (
              <p key={queueId(e.phase, e.name)} className="text-replace">
                Cylinder {e.cylinder} {KIND_LABEL[e.kind].toLowerCase()} (
                {e.phase === "initial" ? "first weigh" : "after machining"}): {e.problem} Open that
                weighing to settle it.
              </p>
            ))}
        </div>
      ) : null}
      <div className="panel overflow-x-auto max-[481px]:overflow-visible max-[481px]:border-0 max-[481px]:bg-transparent max-[481px]:shadow-none">
        <table
          className="w-full border-collapse text-sm max-[481px]:block"
          data-testid="weigh-grid"
          data-ready={ready ? "true" : "false"}
        >
          <thead className="bg-graphite-50 text-graphite-600 max-[481px]:hidden">
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
                  {col.label}
                  {col.optional ? (
                    <span className="font-normal text-graphite-400"> (opt.)</span>
                  ) : null}
                </th>
              ))}
            </tr>
          </thead>
          <tbody className="max-[481px]:block max-[481px]:space-y-3">
            {cylinders.map((c) => (
              <tr
                key={c}
                data-testid={`cylinder-${c}`}
                className="border-t border-graphite-100 max-[481px]:grid max-[481px]:grid-cols-2 max-[481px]:gap-x-2 max-[481px]:rounded max-[481px]:border max-[481px]:border-graphite-200 max-[481px]:bg-white max-[481px]:p-2"
              >
                <th
                  scope="row"
                  className="px-2 py-1 text-left font-mono text-base max-[481px]:col-span-2 max-[481px]:font-sans max-[481px]:font-semibold"
                >
                  <span className="hidden max-[481px]:inline">Cylinder </span>
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
                    <td key={col.kind} className="px-1 py-1 align-top max-[481px]:block">
                      <span
                        aria-hidden="true"
                        className="hidden text-xs text-graphite-600 max-[481px]:block"
                      >
                        {col.label}
                        {col.optional ? " (opt.)" : ""}
                      </span>
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
                        // As wide as what is typed (monospace: one ch per character), never
                        // narrower than a single reading; a whole card's width on a phone.
                        style={{ ["--cell-ch" as string]: Math.max(7, value.length + 1) }}
                        data-width-ch={Math.max(7, value.length + 1)}
                        className={`w-[calc(var(--cell-ch)*1ch+1rem+2px)] rounded border px-2 py-1.5 font-mono text-base max-[481px]:w-full ${
                          cell?.state === "conflict" || cell?.state === "error" || error
                            ? "border-replace bg-red-50"
                            : cell?.state === "queued"
                              ? "border-machine bg-amber-50"
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
                        {cell?.state === "queued" ? (
                          <span className="text-machine">not saved yet: retrying</span>
                        ) : null}
                        {heldNames.has(name) ? (
                          <span className="font-semibold text-machine">held: confirm below</span>
                        ) : null}
                        {cell?.state === "conflict" ? (
                          <ChangedElsewhere
                            inline
                            what={`cylinder ${c} ${col.label.toLowerCase()}`}
                            error={cell.refusal}
                            current={
                              cell.theirs === undefined
                                ? undefined
                                : cell.theirs
                                  ? `${cell.theirs} ${unit}`
                                  : "empty"
                            }
                            onReload={() => void keepTheirs(c, col.kind)}
                          >
                            Yours ({cell.mine || "empty"}) is kept here until you choose.{" "}
                            <button
                              type="button"
                              className="underline"
                              onClick={() =>
                                void commit(c, col.kind, { version: versionOf(c, col.kind) })
                              }
                            >
                              Save mine
                            </button>
                          </ChangedElsewhere>
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
