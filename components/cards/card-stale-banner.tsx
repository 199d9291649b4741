"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { usePathname } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import type { CardPageSize } from "@/db/cards-schema";
import { apiFetch } from "@/lib/api-client";
import type { CardStatus } from "@/lib/cards/status";
import { shopDateTime } from "@/lib/dates/shop-time";
import { cardStatusKey, useCardsIssued } from "./card-queries";
import { IssueCardForm } from "./issue-card-form";

/**
 * Shown on every page of a job while its current balance card no longer matches the job (a
 * weight, target, setting or crank record changed since it was issued), with the next revision
 * one step away. It reads again whenever a bench screen saves (the shared workshop data changes)
 * and when the machinist moves between the job's pages.
 */
export function CardStaleBanner({
  jobId,
  initial,
  canIssue,
  defaultPageSize,
  timeZone,
}: {
  jobId: number;
  initial: CardStatus;
  canIssue: boolean;
  defaultPageSize: CardPageSize;
  /** The shop's time zone (IANA name): the issue time is shown on the shop's clock. */
  timeZone: string;
}) {
  const client = useQueryClient();
  const { data, refetch } = useQuery({
    queryKey: cardStatusKey(jobId),
    queryFn: async () =>
      (await apiFetch<{ status: CardStatus }>(`/api/jobs/${jobId}/cards/status`)).status,
    initialData: initial,
  });
  const status = data ?? initial;
  const issued = useCardsIssued(jobId);
  const [done, setDone] = useState<string | null>(null);

  // A server render with fresher figures (after a settings change) replaces what we hold.
  const firstInitial = useRef(initial);
  useEffect(() => {
    if (firstInitial.current === initial) return;
    firstInitial.current = initial;
    client.setQueryData(cardStatusKey(jobId), initial);
  }, [client, jobId, initial]);

  // Any save on a bench screen updates the shared workshop data: compare again.
  useEffect(
    () =>
      client.getQueryCache().subscribe((event) => {
        const key = event.query.queryKey;
        if (
          event.type === "updated" &&
          event.action.type === "success" &&
          key[0] === "workshop" &&
          key[1] === jobId
        )
          void refetch();
      }),
    [client, jobId, refetch],
  );

  const pathname = usePathname();
  const seenPath = useRef(pathname);
  useEffect(() => {
    if (seenPath.current === pathname) return;
    seenPath.current = pathname;
    void refetch();
  }, [pathname, refetch]);

  if (!status.stale || !status.current) {
    return done ? (
      <p
        className="mb-4 rounded border border-within/40 bg-green-50 p-3 text-sm text-within"
        aria-live="polite"
        data-testid="card-stale-done"
      >
        {done}
      </p>
    ) : null;
  }
  const { current } = status;
  return (
    <section
      className="mb-4 space-y-2 rounded border border-replace/50 bg-red-50 p-3"
      aria-labelledby={`card-stale-${jobId}`}
      data-testid="card-stale-banner"
    >
      <h2 id={`card-stale-${jobId}`} className="font-semibold text-replace">
        The balance card no longer matches this job
      </h2>
      <p className="text-sm">
        Revision {current.revision} (code {current.verificationCode}, issued{" "}
        {shopDateTime(current.issuedAt, timeZone)}) shows figures this job no longer has.{" "}
        {status.message} Issue a new revision so the card in the customer&apos;s hands matches the
        parts.
      </p>
      {canIssue ? (
        <IssueCardForm
          jobId={jobId}
          nextRevision={status.nextRevision}
          blocker={status.blocker}
          exceptions={status.exceptions}
          defaultPageSize={defaultPageSize}
          testIdPrefix="stale-card"
          onIssued={async (card) => {
            setDone(
              `Revision ${card.revision} issued, verification code ${card.verificationCode}: the card matches the job again.`,
            );
            await issued();
          }}
        />
      ) : (
        <p className="text-sm text-graphite-600">
          A machinist or the owner can issue the new revision.
        </p>
      )}
    </section>
  );
}
