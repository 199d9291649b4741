"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
} from "@tanstack/react-table";
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import type { Job, JobSort } from "@/db/jobs";
import { JOB_STATUSES, type JobStatus } from "@/db/schema";
import { apiFetch } from "@/lib/api-client";
import { shopDate } from "@/lib/dates/shop-time";
import { STATUS_LABEL } from "./status";
import { StatusBadge } from "./status-badge";

type Page = { jobs: Job[]; total: number; page: number; pageSize: number };

const column = createColumnHelper<Job>();

/** Cell classes per column: numbers and dates on one line, the engine given room so it does not wrap a word a line. */
const CELL_CLASS: Record<string, string> = {
  number: "whitespace-nowrap",
  engine: "min-w-48",
  promised: "whitespace-nowrap",
  updated: "whitespace-nowrap",
};

/** The columns; "Updated" is the day on the shop's calendar in its time zone. */
function jobColumns(timeZone: string) {
  return [
    column.accessor("number", {
      header: "Job",
      cell: (c) => (
        <Link
          href={`/jobs/${c.row.original.id}`}
          className="font-mono underline decoration-graphite-300 underline-offset-4 hover:decoration-brass-500"
        >
          {c.getValue()}
        </Link>
      ),
    }),
    column.accessor("customerName", { header: "Customer" }),
    column.accessor("engine", { header: "Engine" }),
    column.accessor("status", {
      header: "State",
      cell: (c) => <StatusBadge status={c.getValue()} />,
    }),
    column.accessor((j) => j.spec.promisedDate ?? "", { id: "promised", header: "Promised" }),
    column.accessor((j) => shopDate(new Date(j.updatedAt), timeZone), {
      id: "updated",
      header: "Updated",
    }),
  ];
}

const SORTABLE: Record<string, JobSort> = {
  number: "number",
  customerName: "customer",
  promised: "promised",
  updated: "updated",
};

/** The jobs list: searched, filtered, sorted and paged on the server. */
export function JobsTable({
  initial,
  customerView,
  timeZone,
}: {
  initial: Page;
  customerView: boolean;
  /** The shop's time zone (IANA name), for the dates shown. */
  timeZone: string;
}) {
  const columns = useMemo(() => jobColumns(timeZone), [timeZone]);
  const [search, setSearch] = useState("");
  const [debounced, setDebounced] = useState("");
  const [status, setStatus] = useState<JobStatus | "">("");
  const [sort, setSort] = useState<JobSort>("newest");
  const [page, setPage] = useState(1);
  useEffect(() => {
    const t = setTimeout(() => setDebounced(search.trim()), 250);
    return () => clearTimeout(t);
  }, [search]);

  const params = new URLSearchParams({
    page: String(page),
    pageSize: String(initial.pageSize),
    sort,
  });
  if (debounced) params.set("search", debounced);
  if (status) params.set("status", status);
  const isInitial = page === 1 && !debounced && !status && sort === "newest";
  const query = useQuery({
    queryKey: ["jobs", params.toString()],
    queryFn: () => apiFetch<Page>(`/api/jobs?${params.toString()}`),
    placeholderData: keepPreviousData,
    initialData: isInitial ? initial : undefined,
  });
  const data = query.data ?? initial;
  const table = useReactTable({
    data: data.jobs,
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualPagination: true,
    manualSorting: true,
  });
  const pages = Math.max(1, Math.ceil(data.total / data.pageSize));

  return (
    <div>
      <div className="mb-3 flex flex-wrap items-end gap-3" role="search">
        <label className="w-full text-sm sm:w-auto">
          <span className="mb-1 block font-semibold">Find</span>
          <input
            className="field-input w-full sm:w-64"
            placeholder="Number, engine, customer"
            value={search}
            onChange={(e) => {
              setSearch(e.target.value);
              setPage(1);
            }}
          />
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-semibold">State</span>
          <select
            className="field-input w-48"
            value={status}
            onChange={(e) => {
              setStatus(e.target.value as JobStatus | "");
              setPage(1);
            }}
          >
            <option value="">Any</option>
            {JOB_STATUSES.map((s) => (
              <option key={s} value={s}>
                {STATUS_LABEL[s]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-semibold">Order</span>
          <select
            className="field-input w-48"
            value={sort}
            onChange={(e) => setSort(e.target.value as JobSort)}
          >
            <option value="newest">Newest first</option>
            <option value="oldest">Oldest first</option>
            <option value="number">Job number</option>
            {customerView ? null : <option value="customer">Customer</option>}
            <option value="promised">Promised soonest</option>
            <option value="updated">Recently changed</option>
          </select>
        </label>
        <span aria-live="polite" className="pb-2 text-sm text-graphite-500">
          {query.isFetching ? "Loading…" : `${data.total} job${data.total === 1 ? "" : "s"}`}
        </span>
      </div>
      {/* At phone width each job is a card: the same rows and cells, each with its heading. */}
      <ul className="space-y-2 sm:hidden" data-testid="job-cards">
        {table.getRowModel().rows.map((row) => (
          <li key={row.id} className="panel p-3 text-sm">
            <dl className="grid grid-cols-[6rem_1fr] gap-x-3 gap-y-1">
              {row.getVisibleCells().map((cell) => (
                <div key={cell.id} className="contents">
                  <dt className="text-graphite-500">{String(cell.column.columnDef.header)}</dt>
                  <dd className="min-w-0 break-words">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </dd>
                </div>
              ))}
            </dl>
          </li>
        ))}
        {data.jobs.length === 0 ? (
          <li className="panel p-4 text-center text-graphite-500">No jobs match.</li>
        ) : null}
      </ul>
      <div className="panel hidden overflow-x-auto sm:block">
        <table className="w-full text-left text-sm" data-testid="jobs-table">
          <thead className="border-b border-graphite-200 bg-graphite-50 text-graphite-600">
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => {
                  const key = SORTABLE[h.column.id];
                  return (
                    <th
                      key={h.id}
                      className="px-4 py-2 font-semibold"
                      aria-sort={key && sort === key ? "ascending" : undefined}
                    >
                      {key ? (
                        <button
                          type="button"
                          className="hover:underline"
                          onClick={() => setSort(key)}
                        >
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          {sort === key ? " ▴" : ""}
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-graphite-100 last:border-0">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`px-4 py-2 ${CELL_CLASS[cell.column.id] ?? ""}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {data.jobs.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-4 py-8 text-center text-graphite-500">
                  No jobs match.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <nav
        aria-label="Pages"
        className="mt-3 flex items-center justify-between text-sm text-graphite-600"
      >
        <span>
          Page {page} of {pages}
        </span>
        <span className="flex gap-2">
          <button
            type="button"
            className="btn-secondary py-1"
            disabled={page <= 1}
            onClick={() => setPage((p) => p - 1)}
          >
            Previous
          </button>
          <button
            type="button"
            className="btn-secondary py-1"
            disabled={page >= pages}
            onClick={() => setPage((p) => p + 1)}
          >
            Next
          </button>
        </span>
      </nav>
    </div>
  );
}
