"use client";

import { useActionState, useState } from "react";
import { mergeCustomerAction } from "@/app/(shop)/customers/actions";
import { ActionMessage } from "@/components/ui/field";

export interface MergeCandidate {
  id: number;
  label: string;
}

/**
 * Folds a customer entered twice into this one: the other customer's jobs, quotes, invoices,
 * accounts and invites move here and the other customer is removed. Asks for a tick first.
 */
export function MergeCustomerForm({
  keepId,
  keepName,
  candidates,
}: {
  keepId: number;
  keepName: string;
  candidates: MergeCandidate[];
}) {
  const [result, action, pending] = useActionState(mergeCustomerAction, null);
  const fields = result && !result.ok ? result.fields : undefined;
  // Controlled, so a refusal (no tick yet) keeps the choice instead of resetting the form.
  const [removeId, setRemoveId] = useState("");
  const [confirmed, setConfirmed] = useState(false);
  return (
    <form action={action} className="panel space-y-3 p-4" aria-label="Merge a duplicate">
      <h2 className="font-semibold">Merge a duplicate into this customer</h2>
      <input type="hidden" name="customerId" value={keepId} />
      <p className="text-sm text-graphite-600">
        For a customer entered twice. Everything of the duplicate (jobs with their quotes and
        invoices, online accounts, invites) moves to {keepName}, and the duplicate is removed. This
        cannot be undone.
      </p>
      <div>
        <label htmlFor="merge-remove" className="mb-1 block text-sm font-semibold">
          Duplicate to merge in and remove
        </label>
        <select
          id="merge-remove"
          name="removeId"
          className="field-input w-full"
          value={removeId}
          onChange={(e) => setRemoveId(e.target.value)}
          aria-invalid={fields?.removeId ? true : undefined}
        >
          <option value="">Choose a customer…</option>
          {candidates.map((c) => (
            <option key={c.id} value={c.id}>
              {c.label}
            </option>
          ))}
        </select>
        {fields?.removeId ? <p className="mt-1 text-sm text-replace">{fields.removeId}</p> : null}
      </div>
      <label className="flex items-start gap-2 text-sm">
        <input
          type="checkbox"
          name="confirm"
          value="yes"
          className="mt-1"
          checked={confirmed}
          onChange={(e) => setConfirmed(e.target.checked)}
        />
        <span>
          I have checked these are the same customer; move everything to {keepName} and remove the
          duplicate.
        </span>
      </label>
      {fields?.confirm ? <p className="text-sm text-replace">{fields.confirm}</p> : null}
      <div className="flex flex-wrap items-center gap-4">
        <button className="btn-secondary" type="submit" disabled={pending}>
          Merge customers
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
