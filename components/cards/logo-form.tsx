"use client";

import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { type FormEvent, useState } from "react";
import { ApiError, apiFetch } from "@/lib/api-client";
import type { describeLogo } from "@/lib/cards/logo";

type LogoInfo = ReturnType<typeof describeLogo>;
type Status = { kind: "idle" | "busy" } | { kind: "done" | "failed"; text: string };

const failed = (e: Error): Status => ({
  kind: "failed",
  text: e instanceof ApiError ? e.message : "The logo could not be saved; try again.",
});

/** The owner's upload (PNG or JPEG, at most 2 MB) and removal of the card logo. */
export function LogoForm({ logo }: { logo: LogoInfo }) {
  const router = useRouter();
  const [status, setStatus] = useState<Status>({ kind: "idle" });

  const put = useMutation({
    mutationFn: (form: HTMLFormElement) =>
      apiFetch("/api/settings/logo", { method: "PUT", body: new FormData(form) }),
    onMutate: () => setStatus({ kind: "busy" }),
    onError: (e) => setStatus(failed(e)),
    onSuccess: (_answer, form) => {
      form.reset();
      setStatus({ kind: "done", text: "Logo saved: the next card issued carries it." });
      router.refresh();
    },
  });
  const drop = useMutation({
    mutationFn: () => apiFetch("/api/settings/logo", { method: "DELETE" }),
    onMutate: () => setStatus({ kind: "busy" }),
    onError: (e) => setStatus(failed(e)),
    onSuccess: () => {
      setStatus({
        kind: "done",
        text: "Logo removed: cards issued from now on carry the shop's name only.",
      });
      router.refresh();
    },
  });

  function upload(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    put.mutate(event.currentTarget);
  }
  const remove = () => drop.mutate();

  return (
    <div className="panel space-y-4 p-4">
      {logo.present ? (
        <div className="flex flex-wrap items-center gap-4">
          {/* eslint-disable-next-line @next/next/no-img-element -- served by our API, already sized */}
          <img
            src={logo.url}
            alt="The shop's current logo"
            className="max-h-20 max-w-60 rounded border border-graphite-200 bg-white object-contain p-1"
          />
          <p className="text-sm text-graphite-600">
            {logo.contentType === "image/png" ? "PNG" : "JPEG"}, {logo.width} × {logo.height} px
          </p>
          <button
            type="button"
            className="btn-secondary"
            onClick={remove}
            disabled={status.kind === "busy"}
          >
            Remove logo
          </button>
        </div>
      ) : (
        <p className="text-sm text-graphite-600">
          No logo yet: cards carry the shop&apos;s name only.
        </p>
      )}
      <form onSubmit={upload} className="flex flex-wrap items-end gap-3">
        <div className="grow">
          <label htmlFor="logo-file" className="mb-1 block text-sm font-semibold">
            {logo.present ? "Replace with" : "Logo"} (PNG or JPEG, at most 2 MB)
          </label>
          <input
            id="logo-file"
            name="file"
            type="file"
            accept="image/png,image/jpeg"
            required
            className="field-input"
          />
        </div>
        <button type="submit" className="btn-primary" disabled={status.kind === "busy"}>
          {status.kind === "busy" ? "Saving…" : "Upload"}
        </button>
      </form>
      <p aria-live="polite" className="min-h-6 text-sm" data-testid="logo-status">
        {status.kind === "done" ? <span className="text-within">{status.text}</span> : null}
        {status.kind === "failed" ? <span className="text-replace">{status.text}</span> : null}
      </p>
    </div>
  );
}
