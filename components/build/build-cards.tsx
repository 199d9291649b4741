"use client";

import { useState } from "react";
import type { BuildCardSummary } from "@/db/build-record";
import type { Role } from "@/db/schema";
import { ApiError, apiFetch } from "@/lib/api-client";
import { may } from "@/lib/auth/policy";
import { shopDate } from "@/lib/dates/shop-time";

const groups = (code: string) => `${code.slice(0, 5)}-${code.slice(5)}`;

/** Issued build record PDFs of a job: issue the next revision, download, e-mail. */
export function BuildCards({
  jobId,
  role,
  initial,
  timeZone,
}: {
  jobId: number;
  role: Role;
  initial: BuildCardSummary[];
  /** The shop's time zone (IANA name): the day issued on the shop's calendar. */
  timeZone: string;
}) {
  const [cards, setCards] = useState(initial);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const canIssue = may({ role }, "issue-card");
  const canSend = may({ role }, "send-card");

  async function run(work: () => Promise<string>) {
    setBusy(true);
    setMessage(null);
    try {
      setMessage({ ok: true, text: await work() });
    } catch (e) {
      setMessage({
        ok: false,
        text: e instanceof ApiError ? e.message : "Could not reach the server; nothing was done.",
      });
    } finally {
      setBusy(false);
    }
  }

  const issue = () =>
    run(async () => {
      const { card } = await apiFetch<{ card: BuildCardSummary }>(
        `/api/jobs/${jobId}/build/cards`,
        {
          method: "POST",
        },
      );
      setCards((all) => [card, ...all]);
      return `Revision ${card.revision} issued.`;
    });

  const send = (revision: number) =>
    run(async () => {
      const r = await apiFetch<{ sent: boolean; to: string }>(
        `/api/jobs/${jobId}/build/cards/${revision}/send`,
        { method: "POST", body: {} },
      );
      return r.sent
        ? `Revision ${revision} sent to ${r.to}.`
        : `Revision ${revision} not delivered to ${r.to}; see the mail outbox.`;
    });

  return (
    <section className="panel p-4" aria-labelledby="build-cards-heading">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="build-cards-heading" className="font-semibold">
          Build record PDF
        </h2>
        {canIssue ? (
          <button
            type="button"
            className="btn-primary py-1.5"
            disabled={busy}
            onClick={() => void issue()}
          >
            Issue {cards.length ? "a new revision" : "the build record"}
          </button>
        ) : null}
      </div>
      <p className="mb-2 text-sm text-graphite-600">
        Issued from the record as saved; a later change needs a new revision. Anyone holding it can
        check it at /verify with the code printed on it.
      </p>
      {cards.length === 0 ? (
        <p className="text-sm text-graphite-500">None issued yet.</p>
      ) : (
        <ul className="divide-y divide-graphite-100 text-sm">
          {cards.map((c, i) => (
            <li
              key={c.revision}
              className="flex flex-wrap items-center gap-3 py-2"
              data-testid={`build-card-${c.revision}`}
            >
              <span className="font-semibold">Revision {c.revision}</span>
              <span className={i === 0 ? "text-within" : "text-graphite-500"}>
                {i === 0 ? "current" : "replaced"}
              </span>
              <span className="text-graphite-600">
                {shopDate(new Date(c.issuedAt), timeZone)}
                {c.issuedBy ? ` · ${c.issuedBy}` : ""}
              </span>
              <span className="font-mono">{groups(c.verificationCode)}</span>
              <a className="underline" href={`/api/jobs/${jobId}/build/cards/${c.revision}/pdf`}>
                PDF
              </a>
              {canSend ? (
                <button
                  type="button"
                  className="btn-secondary py-1"
                  disabled={busy}
                  onClick={() => void send(c.revision)}
                >
                  E-mail to the customer
                </button>
              ) : null}
            </li>
          ))}
        </ul>
      )}
      <p
        aria-live="polite"
        data-testid="build-cards-message"
        className={`min-h-5 text-sm ${message?.ok ? "text-within" : "text-replace"}`}
      >
        {message?.text}
      </p>
    </section>
  );
}
