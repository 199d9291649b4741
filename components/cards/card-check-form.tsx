"use client";

import { useMutation } from "@tanstack/react-query";
import { type FormEvent, useState } from "react";
import { ApiError, apiFetch } from "@/lib/api-client";
import type { CardCheck } from "@/lib/cards/verify";
import { VerifiedBuildCardView } from "@/components/build/verified-build-card";
import { VerifiedCardView } from "./verified-card-view";

type State =
  | { kind: "idle" }
  | { kind: "checking" }
  | { kind: "checked"; check: CardCheck }
  | { kind: "failed"; message: string };

/** Uploads a PDF to /api/verify/check and says whether it is a card the shop issued, unchanged. */
export function CardCheckForm() {
  const [state, setState] = useState<State>({ kind: "idle" });

  const send = useMutation({
    mutationFn: (form: FormData) =>
      apiFetch<CardCheck>("/api/verify/check", { method: "POST", body: form }),
    onMutate: () => setState({ kind: "checking" }),
    onSuccess: (check) => setState({ kind: "checked", check }),
    onError: (e) =>
      setState({
        kind: "failed",
        message: e instanceof ApiError ? e.message : "The check failed; try again.",
      }),
  });

  function check(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    send.mutate(new FormData(event.currentTarget));
  }

  return (
    <div className="panel space-y-4 p-4">
      <form onSubmit={check} className="flex flex-wrap items-end gap-3">
        <div className="grow">
          <label htmlFor="verify-file" className="mb-1 block text-sm font-semibold">
            Balance card PDF (or engine build record PDF)
          </label>
          <input
            id="verify-file"
            name="file"
            type="file"
            accept="application/pdf,.pdf"
            required
            className="field-input"
          />
        </div>
        <button type="submit" className="btn-secondary" disabled={state.kind === "checking"}>
          {state.kind === "checking" ? "Checking…" : "Check the file"}
        </button>
      </form>
      <div aria-live="polite" data-testid="card-check-result">
        {state.kind === "failed" ? <p className="text-replace">{state.message}</p> : null}
        {state.kind === "checked" ? <CheckOutcome check={state.check} /> : null}
      </div>
    </div>
  );
}

function CheckOutcome({ check }: { check: CardCheck }) {
  if (check.result === "unknown") {
    return (
      <p className="font-semibold text-graphite-700">
        Not one of ours: this file matches no balance card or engine build record the shop issued,
        and names none.
      </p>
    );
  }
  if ("buildRecord" in check) {
    const record = check.buildRecord;
    return (
      <div className="space-y-3">
        {check.result === "genuine" ? (
          <p className="font-semibold text-within">
            Genuine: this file is exactly the engine build record the shop issued (code{" "}
            {record.verificationCode}, revision {record.revision} of job {record.jobNumber}).
          </p>
        ) : (
          <p className="font-semibold text-replace">
            Altered: this file names engine build record {record.verificationCode}, revision{" "}
            {record.revision} of job {record.jobNumber}, but it is not the file the shop issued. Do
            not rely on its figures; the record on file is below.
          </p>
        )}
        <VerifiedBuildCardView card={record} headingLevel={2} />
      </div>
    );
  }
  return (
    <div className="space-y-3">
      {check.result === "genuine" ? (
        <p className="font-semibold text-within">
          Genuine: this file is exactly the card the shop issued (code {check.card.verificationCode}
          , revision {check.card.revision}).
        </p>
      ) : (
        <p className="font-semibold text-replace">
          Altered: this file names card {check.card.verificationCode}, revision{" "}
          {check.card.revision}, but it is not the file the shop issued. Do not rely on its figures;
          the card on record is below.
        </p>
      )}
      <VerifiedCardView card={check.card} />
    </div>
  );
}
