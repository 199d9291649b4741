"use client";

import type { ReactNode } from "react";
import { ApiError } from "@/lib/api-client";

/**
 * A write refused because what it was based on changed since the page loaded: 409 with our error
 * shape and the code `stale_write` (`StaleWriteError` on the server). Other 409s are rules
 * ("the shop needs one owner", "already invoiced") and keep their own message.
 */
export function isStaleWrite(e: unknown): e is ApiError {
  return (
    e instanceof ApiError &&
    e.status === 409 &&
    typeof e.body?.error?.message === "string" &&
    e.body.error.code === "stale_write"
  );
}

/**
 * The same test for a server action's answer (`ActionResult`): a failure with status 409 and the
 * code `stale_write`. Other 409s are rules and keep their own message.
 */
export function isStaleResult(
  result: { ok: boolean; status?: number; code?: string } | null | undefined,
): boolean {
  return !!result && !result.ok && result.status === 409 && result.code === "stale_write";
}

/**
 * What the refusal says is saved now, where its body carries it in words. The stored version
 * number (`currentVersion`) is bookkeeping, never shown to a person.
 */
function currentFrom(error: unknown): string | null {
  if (!isStaleWrite(error)) return null;
  const { current } = error.body;
  if (typeof current === "string" && current.trim() !== "") return current;
  return null;
}

/**
 * The one view of a stale write (409) on every screen: says plainly that someone else changed
 * `what` since this page loaded, shows what is saved now when it is known (`current` from the
 * screen, else the refusal's body), and offers one button to load the latest. `children` holds a
 * screen's own extra choice (the weigh-in's "Save mine").
 */
export function ChangedElsewhere({
  what,
  onReload,
  error,
  current,
  loading = false,
  inline = false,
  children,
}: {
  /** In the machinist's words, with its article: "this job's settings", "cylinder 3 piston". */
  what: string;
  onReload: () => void;
  /** The refusal, for what its body says is current. */
  error?: unknown;
  /** What the screen already knows is saved now (wins over the body's). */
  current?: ReactNode;
  /** The latest is on its way: the button waits. */
  loading?: boolean;
  /** Small, inside a table cell. */
  inline?: boolean;
  children?: ReactNode;
}) {
  const now = current ?? currentFrom(error);
  const Tag = inline ? "span" : "div";
  return (
    <Tag
      role="status"
      data-testid="changed-elsewhere"
      className={
        inline
          ? "text-replace"
          : "rounded border border-replace/40 bg-red-50 p-3 text-sm text-replace"
      }
    >
      <Tag className={inline ? undefined : "block"}>
        Not saved: someone else changed {what} since this page loaded.
        {now !== null && now !== undefined ? <> Saved now: {now}.</> : null}
      </Tag>{" "}
      <button
        type="button"
        className={inline ? "underline" : "btn-secondary mt-2"}
        onClick={onReload}
        disabled={loading}
      >
        {loading ? "Loading…" : "Load the latest"}
      </button>
      {children ? <> {children}</> : null}
    </Tag>
  );
}
