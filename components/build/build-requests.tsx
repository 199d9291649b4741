"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { BuildRequest } from "@/db/build-record";
import type { Role } from "@/db/schema";
import { ApiError, apiFetch } from "@/lib/api-client";
import { may } from "@/lib/auth/policy";

const STATE_LABEL = { open: "Open", done: "Done", explained: "Not done" } as const;
const STATE_CLASS = {
  open: "text-machine",
  done: "text-within",
  explained: "text-graphite-600",
} as const;

/**
 * The customer's requests for the build on the job page: the counter, machinist and owner
 * write them down; the machinist and owner tick each done or say why not. The job cannot go
 * to "ready" while one is open (the server refuses it).
 */
export function BuildRequests({
  jobId,
  role,
  initial,
}: {
  jobId: number;
  role: Role;
  initial: BuildRequest[];
}) {
  const router = useRouter();
  const [requests, setRequests] = useState(initial);
  const [text, setText] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [explaining, setExplaining] = useState<number | null>(null);
  const [note, setNote] = useState("");
  /** A change refused because someone else changed that request first, with the list as saved now. */
  const [stale, setStale] = useState<{
    error: unknown;
    request: BuildRequest;
    latest: BuildRequest[] | null;
  } | null>(null);
  const canAdd = may({ role }, "add-build-request");
  const canResolve = may({ role }, "edit-build-record");
  const open = requests.filter((r) => r.state === "open").length;

  const replace = (saved: BuildRequest) =>
    setRequests((all) => all.map((r) => (r.id === saved.id ? saved : r)));

  const fetchLatest = () =>
    apiFetch<{ requests: BuildRequest[] }>(`/api/jobs/${jobId}/build/requests`)
      .then((fresh) => fresh.requests)
      .catch(() => null);

  async function run(work: () => Promise<void>, request?: BuildRequest) {
    setBusy(true);
    setError(null);
    setStale(null);
    try {
      await work();
      router.refresh();
    } catch (e) {
      if (isStaleWrite(e) && request) {
        // What is saved now is fetched so the refusal can say it; the list changes on request.
        setStale({ error: e, request, latest: await fetchLatest() });
      } else if (e instanceof ApiError) {
        setError(Object.values(e.fields)[0] ?? e.message);
      } else setError("Could not reach the server; nothing was saved.");
    } finally {
      setBusy(false);
    }
  }

  async function loadLatest() {
    const latest = stale?.latest ?? (await fetchLatest());
    if (latest === null) {
      setError("Could not reach the server; try again.");
      return;
    }
    setRequests(latest);
    setStale(null);
    setExplaining(null);
  }

  /** The request as saved now, in the list's words ("Done", "Not done: no gear supplied"). */
  const savedNow = (id: number): string | null => {
    const now = stale?.latest?.find((r) => r.id === id);
    if (!stale?.latest) return null;
    if (!now) return "removed";
    return now.note ? `${STATE_LABEL[now.state]} (${now.note})` : STATE_LABEL[now.state];
  };

  const add = () =>
    run(async () => {
      const { request } = await apiFetch<{ request: BuildRequest }>(
        `/api/jobs/${jobId}/build/requests`,
        { method: "POST", body: { text } },
      );
      setRequests((all) => [...all, request]);
      setText("");
    });

  const setState = (r: BuildRequest, state: BuildRequest["state"], why: string | null = null) =>
    run(async () => {
      const { request } = await apiFetch<{ request: BuildRequest }>(
        `/api/jobs/${jobId}/build/requests/${r.id}`,
        { method: "PATCH", body: { version: r.version, state, note: why } },
      );
      replace(request);
      setExplaining(null);
      setNote("");
    }, r);

  return (
    <section className="panel p-4" aria-labelledby="build-requests-heading">
      <div className="mb-2 flex flex-wrap items-baseline gap-x-3">
        <h2 id="build-requests-heading" className="font-semibold">
          Customer&apos;s requests for the build
        </h2>
        <p className="text-sm text-graphite-600" data-testid="requests-open-count">
          {requests.length === 0
            ? "None written down."
            : open === 0
              ? "All done or explained."
              : `${open} open: the job cannot go to “Ready” until each is done or explained.`}
        </p>
      </div>
      {requests.length > 0 ? (
        <ul className="divide-y divide-graphite-100 text-sm">
          {requests.map((r) => (
            <li key={r.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2">
              <span className={`w-20 font-semibold ${STATE_CLASS[r.state]}`}>
                {STATE_LABEL[r.state]}
              </span>
              <span className="flex-1">
                {r.text}
                {r.note ? (
                  <span className="block text-graphite-600">
                    {r.state === "explained" ? "Why not: " : "Note: "}
                    {r.note}
                  </span>
                ) : null}
              </span>
              {canResolve ? (
                r.state === "open" ? (
                  <span className="flex gap-2">
                    <button
                      type="button"
                      className="btn-secondary py-1"
                      disabled={busy}
                      onClick={() => setState(r, "done")}
                    >
                      Done
                    </button>
                    <button
                      type="button"
                      className="btn-secondary py-1"
                      disabled={busy}
                      onClick={() => {
                        setExplaining(r.id);
                        setNote("");
                      }}
                    >
                      Not done…
                    </button>
                  </span>
                ) : (
                  <button
                    type="button"
                    className="btn-secondary py-1"
                    disabled={busy}
                    onClick={() => setState(r, "open")}
                  >
                    Reopen
                  </button>
                )
              ) : null}
              {explaining === r.id ? (
                <form
                  className="flex w-full flex-wrap items-end gap-2"
                  onSubmit={(e) => {
                    e.preventDefault();
                    void setState(r, "explained", note);
                  }}
                >
                  <label className="flex-1 text-sm">
                    <span className="mb-1 block font-semibold">Why not</span>
                    <input
                      className="field-input"
                      value={note}
                      autoFocus
                      onChange={(e) => setNote(e.target.value)}
                      maxLength={500}
                    />
                  </label>
                  <button type="submit" className="btn-primary py-1.5" disabled={busy}>
                    Save reason
                  </button>
                  <button
                    type="button"
                    className="btn-secondary py-1.5"
                    onClick={() => setExplaining(null)}
                  >
                    Cancel
                  </button>
                </form>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      {canAdd ? (
        <form
          className="mt-3 flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            void add();
          }}
        >
          <label className="flex-1 text-sm">
            <span className="mb-1 block font-semibold">New request</span>
            <input
              className="field-input"
              value={text}
              onChange={(e) => setText(e.target.value)}
              maxLength={300}
              placeholder="e.g. fit the timing gear they brought"
            />
          </label>
          <button type="submit" className="btn-primary py-1.5" disabled={busy}>
            Add request
          </button>
        </form>
      ) : null}
      {stale ? (
        <ChangedElsewhere
          what={`the request “${stale.request.text}”`}
          error={stale.error}
          current={savedNow(stale.request.id)}
          onReload={() => void loadLatest()}
        />
      ) : null}
      <div aria-live="polite" className="min-h-5 text-sm text-replace" data-testid="requests-error">
        {error}
      </div>
    </section>
  );
}
