"use client";

import { useInfiniteQuery } from "@tanstack/react-query";
import type { ReactNode } from "react";
import type { JobChange, JobChangesPage } from "@/db/audit";
import { apiFetch } from "@/lib/api-client";
import { shopDateTime } from "@/lib/dates/shop-time";
import { describeChange } from "./change-sentences";

type Props = {
  changes: JobChange[];
  unit: "g" | "oz";
  timeZone: string;
};

/**
 * The job's history, newest first, as sentences; saves that changed nothing are left out. Times
 * are on the shop's clock in its time zone (an IANA name). Given the job's id and the cursor of
 * the first page (`earlier`, not null when older changes exist), "Show earlier changes" fetches
 * them a page at a time.
 */
export function JobChanges(props: Props & { jobId?: number; earlier?: number | null }) {
  if (props.jobId === undefined || props.earlier == null) return <ChangeList {...props} />;
  return <PagedChanges {...props} jobId={props.jobId} earlier={props.earlier} />;
}

function PagedChanges({
  jobId,
  changes,
  earlier,
  unit,
  timeZone,
}: Props & { jobId: number; earlier: number }) {
  const query = useInfiniteQuery({
    // The newest entry names the first page: a page rendered after a save starts over from it.
    queryKey: ["job-changes", jobId, changes[0]?.id ?? 0],
    queryFn: ({ pageParam }) =>
      apiFetch<JobChangesPage>(
        `/api/jobs/${jobId}/history${pageParam === undefined ? "" : `?before=${pageParam}`}`,
      ),
    initialPageParam: undefined as number | undefined,
    initialData: { pages: [{ changes, earlier }], pageParams: [undefined] },
    getNextPageParam: (last) => last.earlier ?? undefined,
    staleTime: Infinity,
    refetchOnWindowFocus: false,
  });
  const all = query.data.pages.flatMap((p) => p.changes);
  return (
    <ChangeList changes={all} unit={unit} timeZone={timeZone} more={query.hasNextPage}>
      {query.hasNextPage ? (
        <button
          type="button"
          className="btn-secondary mt-2 py-1"
          disabled={query.isFetchingNextPage}
          onClick={() => void query.fetchNextPage()}
        >
          {query.isFetchingNextPage ? "Loading earlier changes…" : "Show earlier changes"}
        </button>
      ) : null}
      {query.isFetchNextPageError ? (
        <p className="mt-1 text-sm text-replace" role="alert">
          Earlier changes could not be loaded: {query.error?.message}
        </p>
      ) : null}
    </ChangeList>
  );
}

function ChangeList({
  changes,
  unit,
  timeZone,
  more = false,
  children,
}: Props & { more?: boolean; children?: ReactNode }) {
  const entries = changes
    .map((c) => ({ ...c, lines: describeChange(c, unit) }))
    .filter((c) => c.lines.length > 0);
  if (entries.length === 0 && !more) return null;
  return (
    <section className="panel p-4" aria-labelledby="changes-title">
      <h2 id="changes-title" className="mb-2 text-sm font-semibold text-graphite-600">
        Changes (newest first)
      </h2>
      <ol className="max-h-96 space-y-1 overflow-y-auto text-sm" data-testid="job-changes">
        {entries.map((c) => (
          <li key={c.id} className="grid gap-x-2 sm:grid-cols-[12rem_9rem_1fr]">
            <span className="font-mono text-graphite-500">{shopDateTime(c.at, timeZone)}</span>
            <span className="truncate text-graphite-700">{c.who ?? "system"}</span>
            <span>{c.lines.join("; ")}.</span>
          </li>
        ))}
      </ol>
      {children}
    </section>
  );
}
