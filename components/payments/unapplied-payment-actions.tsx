"use client";

import { useId, useState } from "react";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { UnappliedPayment } from "@/db/payments";
import type { ApiError } from "@/lib/api-client";
import { callPayments } from "./call";

/**
 * "Apply as payment" and "Mark refunded" (with its note) for one online payment kept to
 * reconcile. The server decides whether it fits the invoice and says why not; `onDone` runs after
 * either worked, with the message to show. When someone else settled it since the page loaded
 * (a stale write) the shared "changed elsewhere" notice offers `onReload`.
 */
export function UnappliedPaymentActions({
  item,
  onDone,
  onReload,
}: {
  item: Pick<UnappliedPayment, "id" | "version" | "invoiceId">;
  onDone: (message: string) => void;
  onReload: () => void;
}) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<{ message: string; refusal: ApiError } | null>(null);
  const [refunding, setRefunding] = useState(false);
  const [note, setNote] = useState("");
  const noteId = useId();

  async function run(path: "apply" | "refund", body: object, done: string) {
    setBusy(true);
    setError(null);
    const outcome = await callPayments(`/api/payments/unapplied/${item.id}/${path}`, "POST", {
      version: item.version,
      ...body,
    });
    setBusy(false);
    if (!outcome.ok) return setError({ message: outcome.message, refusal: outcome.error });
    setRefunding(false);
    onDone(done);
  }

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-2">
        {item.invoiceId !== null ? (
          <button
            type="button"
            className="btn-primary"
            disabled={busy}
            onClick={() => run("apply", {}, "Applied as a payment on the invoice.")}
          >
            Apply as payment
          </button>
        ) : null}
        <button
          type="button"
          className="btn-secondary"
          disabled={busy}
          aria-expanded={refunding}
          onClick={() => setRefunding((r) => !r)}
        >
          Mark refunded
        </button>
      </div>
      {refunding ? (
        <form
          className="flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            void run("refund", { note: note.trim() }, "Marked refunded.");
          }}
        >
          <label className="text-sm" htmlFor={noteId}>
            <span className="mb-1 block">What was done (refund reference, or why)</span>
            <input
              id={noteId}
              className="field-input w-72 py-1"
              maxLength={500}
              value={note}
              onChange={(e) => setNote(e.target.value)}
            />
          </label>
          <button type="submit" className="btn-secondary" disabled={busy}>
            Save as refunded
          </button>
        </form>
      ) : null}
      <div aria-live="polite" className="text-sm">
        {error && isStaleWrite(error.refusal) ? (
          <ChangedElsewhere
            what="this payment"
            error={error.refusal}
            onReload={() => {
              setError(null);
              onReload();
            }}
          />
        ) : error ? (
          <p className="text-replace">{error.message}</p>
        ) : null}
      </div>
    </div>
  );
}
