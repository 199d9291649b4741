"use client";

import { type FormEvent, useId, useState } from "react";
import type { CardPageSize } from "@/db/cards-schema";
import { ApiError, apiFetch } from "@/lib/api-client";
import type { CardSummary } from "@/lib/cards/summary";

type Status =
  { kind: "idle" } | { kind: "busy"; text: string } | { kind: "done" | "failed"; text: string };

export interface IssueCardFormProps {
  jobId: number;
  /** The revision the button issues. */
  nextRevision: number;
  /** Why a card cannot be issued yet, or null. */
  blocker: string | null;
  /**
   * Parts the card would carry only with a reason (lib/cards/exceptions.ts), as the card prints
   * them. The server checks again: when it finds some the page did not know of, the form asks.
   */
  exceptions: string[];
  defaultPageSize: CardPageSize;
  /** Offer the paper choice (the job page); the banner issues on the default paper. */
  choosePaper?: boolean;
  /** Prefix of the test ids, so two forms on one page stay apart. */
  testIdPrefix?: string;
  onIssued: (card: CardSummary) => void | Promise<void>;
}

/**
 * Issues the next revision of the balance card. A set with parts outside the band, light, to
 * re-select or confirmed as outliers is issued only with "Issue with these parts" ticked and a
 * reason, which the card prints.
 */
export function IssueCardForm(props: IssueCardFormProps) {
  const { jobId, nextRevision, blocker, defaultPageSize, choosePaper = false } = props;
  const tid = props.testIdPrefix ?? "card";
  const id = useId();
  const [pageSize, setPageSize] = useState<CardPageSize>(defaultPageSize);
  const [status, setStatus] = useState<Status>({ kind: "idle" });
  // What the server said the card would carry, when the page did not know it yet.
  const [found, setFound] = useState<string | null>(null);
  const [override, setOverride] = useState(false);
  const [reason, setReason] = useState("");
  const [reasonError, setReasonError] = useState<string | undefined>();
  const needsOverride = props.exceptions.length > 0 || found !== null;

  async function issue(event: FormEvent) {
    event.preventDefault();
    setReasonError(undefined);
    if (override && reason.trim().length < 3) {
      setReasonError("Give the reason for issuing the card with these parts; it is printed on it.");
      return;
    }
    setStatus({
      kind: "busy",
      text: "Issuing the card: working out the figures and making the PDF…",
    });
    try {
      const { card } = await apiFetch<{ card: CardSummary }>(`/api/jobs/${jobId}/cards`, {
        method: "POST",
        body: { pageSize, ...(override ? { override: true, overrideReason: reason.trim() } : {}) },
      });
      setStatus({
        kind: "done",
        text: `Revision ${card.revision} issued, verification code ${card.verificationCode}.`,
      });
      setFound(null);
      setOverride(false);
      setReason("");
      await props.onIssued(card);
    } catch (error) {
      if (error instanceof ApiError && error.body.error?.code === "override_required") {
        setFound(error.message);
        setStatus({
          kind: "failed",
          text: "Not issued: this card needs a reason first (see above).",
        });
        return;
      }
      if (error instanceof ApiError) setReasonError(error.fields.overrideReason);
      setStatus({
        kind: "failed",
        text:
          error instanceof ApiError
            ? error.message
            : "The server could not be reached. Check the connection and try again.",
      });
    }
  }

  const blocked = blocker !== null || (needsOverride && (!override || reason.trim() === ""));
  return (
    <form onSubmit={issue} className="space-y-2" aria-label="Issue the balance card">
      {blocker ? (
        <p className="text-sm text-machine" data-testid={`${tid}-blocker`}>
          {blocker}
        </p>
      ) : null}
      {!blocker && needsOverride ? (
        <div
          className="space-y-2 rounded border border-replace/40 bg-red-50 p-3 text-sm"
          data-testid={`${tid}-exceptions`}
        >
          {props.exceptions.length > 0 ? (
            <>
              <p className="font-semibold">
                This card would carry parts that are not as a matched set should be:
              </p>
              <ul className="list-disc pl-5">
                {props.exceptions.map((e) => (
                  <li key={e}>{e}</li>
                ))}
              </ul>
            </>
          ) : (
            <p>{found}</p>
          )}
          <label className="flex items-center gap-2 font-semibold">
            <input
              type="checkbox"
              checked={override}
              onChange={(e) => setOverride(e.target.checked)}
            />
            Issue with these parts
          </label>
          <div>
            <label htmlFor={`${id}-reason`} className="mb-1 block font-semibold">
              Reason (printed on the card)
            </label>
            <input
              id={`${id}-reason`}
              className="field-input"
              maxLength={300}
              value={reason}
              disabled={!override}
              onChange={(e) => setReason(e.target.value)}
              aria-invalid={reasonError ? true : undefined}
              aria-describedby={reasonError ? `${id}-reason-error` : undefined}
            />
            {reasonError ? (
              <p id={`${id}-reason-error`} className="mt-1 text-replace">
                {reasonError}
              </p>
            ) : null}
          </div>
        </div>
      ) : null}
      <div className="flex flex-wrap items-end gap-3">
        {choosePaper ? (
          <div>
            <label htmlFor={`${id}-paper`} className="mb-1 block text-sm font-semibold">
              Paper
            </label>
            <select
              id={`${id}-paper`}
              className="field-input w-auto"
              value={pageSize}
              onChange={(e) => setPageSize(e.target.value as CardPageSize)}
            >
              <option value="A4">A4</option>
              <option value="LETTER">US Letter</option>
            </select>
          </div>
        ) : null}
        <button type="submit" className="btn-primary" disabled={status.kind === "busy" || blocked}>
          {status.kind === "busy"
            ? "Issuing…"
            : nextRevision > 1
              ? `Issue balance card (revision ${nextRevision})`
              : "Issue balance card"}
        </button>
      </div>
      <p aria-live="polite" data-testid={`${tid}-issue-status`} className="min-h-6 text-sm">
        {status.kind === "busy" ? <span className="text-graphite-600">{status.text}</span> : null}
        {status.kind === "done" ? <span className="text-within">{status.text}</span> : null}
        {status.kind === "failed" ? <span className="text-replace">{status.text}</span> : null}
      </p>
    </form>
  );
}
