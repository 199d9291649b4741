"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api-client";
import type { JobBilling } from "@/lib/billing/job-billing";

export const jobBillingKey = (jobId: number) => ["job-billing", jobId] as const;

/** The job's quotes and invoices with the moves open to this person, kept fresh by TanStack Query. */
export function useJobBilling(jobId: number, initialData: JobBilling) {
  return useQuery({
    queryKey: jobBillingKey(jobId),
    queryFn: () => apiFetch<JobBilling>(`/api/jobs/${jobId}/billing`),
    initialData,
  });
}

/** One billing write: the API call, then the job's billing read again whatever it answered. */
export function useBillingWrite<T>(jobId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (call: { url: string; method: string; body?: unknown }) =>
      apiFetch<T>(call.url, { method: call.method, body: call.body }),
    onSettled: () => client.invalidateQueries({ queryKey: jobBillingKey(jobId) }),
  });
}
