"use client";

import { useQuery } from "@tanstack/react-query";
import { type FormEvent, useState } from "react";
import type { CardPageSize } from "@/db/cards-schema";
import { ApiError, apiFetch } from "@/lib/api-client";
import { shopDateTime } from "@/lib/dates/shop-time";
import type { CardSendResult } from "@/lib/cards/send";
import type { CardMailSummary, CardSummary } from "@/lib/cards/summary";
import { cardsKey, useCardsIssued } from "./card-queries";
import { IssueCardForm } from "./issue-card-form";

export interface CardsPanelProps {
  jobId: number;
  initialCards: CardSummary[];
  canIssue: boolean;
  canSend: boolean;
  /** Why a card cannot be issued yet (the weigh-in is not complete, a weight is held), or null. */
  blocker: string | null;
  /** Parts the next card would carry only with a reason (lib/cards/exceptions.ts). */
  exceptions: string[];
  customerEmail: string | null;
  defaultPageSize: CardPageSize;
  /** The shop's time zone (IANA name): times are shown on the shop's clock. */
  timeZone: string;
}

type Status =
  { kind: "idle" } | { kind: "busy"; text: string } | { kind: "done" | "failed"; text: string };

const PAPER: Record<CardPageSize, string> = { A4: "A4", LETTER: "US Letter" };

function messageOf(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  return "The server could not be reached. Check the connection and try again.";
}

function StatusLine({ status, testId }: { status: Status; testId: string }) {
  return (
    <p aria-live="polite" data-testid={testId} className="min-h-6 text-sm">
      {status.kind === "busy" ? <span className="text-graphite-600">{status.text}</span> : null}
      {status.kind === "done" ? <span className="text-within">{status.text}</span> : null}
      {status.kind === "failed" ? <span className="text-replace">{status.text}</span> : null}
    </p>
  );
}

/** The job's balance cards: every revision, issuing the next one, e-mailing one to the customer. */
export function CardsPanel(props: CardsPanelProps) {
  const { jobId, canIssue, canSend, blocker, customerEmail, defaultPageSize } = props;
  const { data } = useQuery({
    queryKey: cardsKey(jobId),
    queryFn: async () =>
      (await apiFetch<{ cards: CardSummary[] }>(`/api/jobs/${jobId}/cards`)).cards,
    initialData: props.initialCards,
  });
  const cards = data ?? props.initialCards;
  const issued = useCardsIssued(jobId);
  const refresh = () => issued().then(() => undefined);

  const current = cards.find((c) => c.current);
  return (
    <div className="space-y-4">
      {cards.length === 0 ? (
        <p className="text-sm text-graphite-600">
          No balance card has been issued for this job yet.
        </p>
      ) : (
        <ul className="divide-y divide-graphite-200 rounded border border-graphite-200">
          {cards.map((card) => (
            <CardRow
              key={card.revision}
              card={card}
              jobId={jobId}
              canSend={canSend}
              customerEmail={customerEmail}
              timeZone={props.timeZone}
              onSent={() => refresh().catch(() => undefined)}
            />
          ))}
        </ul>
      )}

      {canIssue ? (
        <div className="space-y-2 border-t border-graphite-200 pt-4">
          <IssueCardForm
            jobId={jobId}
            nextRevision={(cards[0]?.revision ?? 0) + 1}
            blocker={blocker}
            exceptions={props.exceptions}
            defaultPageSize={defaultPageSize}
            choosePaper
            onIssued={() => refresh().catch(() => undefined)}
          />
          {current ? (
            <p className="text-xs text-graphite-500">
              Issuing again makes a new revision with today&apos;s figures; revision{" "}
              {current.revision} stays on file and is marked as replaced.
            </p>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}

function CardRow({
  card,
  jobId,
  canSend,
  customerEmail,
  timeZone,
  onSent,
}: {
  card: CardSummary;
  jobId: number;
  canSend: boolean;
  customerEmail: string | null;
  timeZone: string;
  onSent: () => void;
}) {
  const when = (iso: string) => shopDateTime(iso, timeZone);
  const [open, setOpen] = useState(false);
  const last: CardMailSummary | undefined = card.mail[0];
  return (
    <li className="space-y-2 p-3" data-testid={`card-revision-${card.revision}`}>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-1">
        <span className="font-semibold">Revision {card.revision}</span>
        {card.current ? (
          <span className="rounded bg-within/10 px-2 py-0.5 text-xs font-semibold text-within">
            Current
          </span>
        ) : (
          <span className="rounded bg-graphite-100 px-2 py-0.5 text-xs font-semibold text-graphite-600">
            Replaced by revision {card.supersededByRevision}
          </span>
        )}
        <span className="text-sm text-graphite-600">
          {when(card.issuedAt)}
          {card.issuedBy.name ? ` · ${card.issuedBy.name}` : ""} · {PAPER[card.pageSize]}
        </span>
        <a
          className="font-mono text-sm underline underline-offset-4"
          href={card.verifyUrl}
          title="Verification code"
        >
          {card.verificationCode}
        </a>
        <a className="btn-secondary px-3 py-1 text-sm" href={card.pdfUrl} download={card.fileName}>
          Download PDF
        </a>
        {canSend ? (
          <button
            type="button"
            className="btn-secondary px-3 py-1 text-sm"
            aria-expanded={open}
            onClick={() => setOpen((o) => !o)}
          >
            E-mail to customer
          </button>
        ) : null}
      </div>
      {last ? (
        <p className="text-xs text-graphite-500">
          Last e-mail to {last.to}, {when(last.at)}:{" "}
          {last.status === "sent" ? (
            <span className="text-within">sent</span>
          ) : last.status === "failed" ? (
            <span className="text-replace">failed ({last.error ?? "no reason given"})</span>
          ) : (
            <span>being sent</span>
          )}
        </p>
      ) : null}
      {open ? (
        <SendForm card={card} jobId={jobId} customerEmail={customerEmail} onSent={onSent} />
      ) : null}
    </li>
  );
}

function SendForm({
  card,
  jobId,
  customerEmail,
  onSent,
}: {
  card: CardSummary;
  jobId: number;
  customerEmail: string | null;
  onSent: () => void;
}) {
  const [to, setTo] = useState(customerEmail ?? "");
  const [message, setMessage] = useState("");
  const [status, setStatus] = useState<Status>({ kind: "idle" });
  const [fieldError, setFieldError] = useState<string | undefined>();
  const id = `send-${jobId}-${card.revision}`;

  async function send(event: FormEvent) {
    event.preventDefault();
    setFieldError(undefined);
    setStatus({ kind: "busy", text: "Sending…" });
    try {
      const result = await apiFetch<CardSendResult>(
        `/api/jobs/${jobId}/cards/${card.revision}/send`,
        { method: "POST", body: { to, message } },
      );
      setStatus({ kind: "done", text: `Sent to ${result.mail.to}.` });
      onSent();
    } catch (error) {
      if (error instanceof ApiError) setFieldError(error.fields.to);
      const failed =
        error instanceof ApiError && error.status === 502
          ? `Not sent: ${error.message} You can try again.`
          : messageOf(error);
      setStatus({ kind: "failed", text: failed });
      if (error instanceof ApiError && error.status === 502) onSent();
    }
  }

  return (
    <form onSubmit={send} className="grid gap-2 rounded bg-graphite-50 p-3 sm:grid-cols-2">
      <div>
        <label htmlFor={`${id}-to`} className="mb-1 block text-sm font-semibold">
          To
        </label>
        <input
          id={`${id}-to`}
          type="email"
          required
          className="field-input"
          value={to}
          onChange={(e) => setTo(e.target.value)}
          aria-invalid={fieldError ? true : undefined}
          aria-describedby={fieldError ? `${id}-to-error` : undefined}
        />
        {fieldError ? (
          <p id={`${id}-to-error`} className="mt-1 text-sm text-replace">
            {fieldError}
          </p>
        ) : null}
      </div>
      <div className="sm:col-span-2">
        <label htmlFor={`${id}-message`} className="mb-1 block text-sm font-semibold">
          Message (optional)
        </label>
        <textarea
          id={`${id}-message`}
          className="field-input"
          rows={3}
          maxLength={2000}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
        />
      </div>
      <div className="flex items-center gap-3 sm:col-span-2">
        <button type="submit" className="btn-primary" disabled={status.kind === "busy"}>
          {status.kind === "busy" ? "Sending…" : status.kind === "failed" ? "Try again" : "Send"}
        </button>
        <StatusLine status={status} testId={`card-send-status-${card.revision}`} />
      </div>
    </form>
  );
}
