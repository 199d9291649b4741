"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { apiFetch } from "@/lib/api-client";
import type { Workshop } from "@/lib/workshop/load";

export const workshopKey = (jobId: number) => ["workshop", jobId] as const;

/** The job's bench record, shared by every bench screen and kept fresh by TanStack Query. */
export function useWorkshop(jobId: number, initialData?: Workshop) {
  return useQuery({
    queryKey: workshopKey(jobId),
    queryFn: () => apiFetch<Workshop>(`/api/jobs/${jobId}/workshop`),
    initialData,
  });
}

export function useUpdateWorkshop(jobId: number) {
  const client = useQueryClient();
  return (update: (w: Workshop) => Workshop) =>
    client.setQueryData<Workshop>(workshopKey(jobId), (old) => (old ? update(old) : old));
}

/**
 * Marks the bench record as needing the full plan again without fetching it now: a weight save
 * answers the plan without the pairing search, and the next screen that needs the record (the
 * removal plan with its pairing offer) fetches it when it opens.
 */
export function useMarkWorkshopStale(jobId: number) {
  const client = useQueryClient();
  return () => void client.invalidateQueries({ queryKey: workshopKey(jobId), refetchType: "none" });
}

/**
 * Loads the latest bench record now (after a stale write, 409) into every bench screen; resolves
 * to it, or to null when the server could not be reached.
 */
export function useReloadWorkshop(jobId: number) {
  const client = useQueryClient();
  const [loading, setLoading] = useState(false);
  async function reload(): Promise<Workshop | null> {
    setLoading(true);
    try {
      return await client.fetchQuery({
        queryKey: workshopKey(jobId),
        queryFn: () => apiFetch<Workshop>(`/api/jobs/${jobId}/workshop`),
        staleTime: 0,
      });
    } catch {
      return null;
    } finally {
      setLoading(false);
    }
  }
  return { reload, loading };
}
