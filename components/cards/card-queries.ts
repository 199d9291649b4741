"use client";

import { useQueryClient } from "@tanstack/react-query";

/** The job's card list and whether its current card still matches: shared by the panel and the banner. */
export const cardsKey = (jobId: number) => ["cards", jobId] as const;
export const cardStatusKey = (jobId: number) => ["card-status", jobId] as const;

/** After a card is issued anywhere on the page: the list and the banner read again. */
export function useCardsIssued(jobId: number) {
  const client = useQueryClient();
  return () =>
    Promise.all([
      client.invalidateQueries({ queryKey: cardsKey(jobId) }),
      client.invalidateQueries({ queryKey: cardStatusKey(jobId) }),
    ]);
}
