"use client";

import { startTransition, useActionState, useRef, useState } from "react";
import { mergeCustomerAction } from "@/app/(shop)/customers/actions";
import { ActionMessage } from "@/components/ui/field";
import type { Customer } from "@/db/customers";
import { CustomerPicker } from "./customer-picker";

/** How a customer reads in the picker: name, company, e-mail and the shop's number for them. */
function labelOf(c: Customer): string {
  return [c.name, c.company, c.email].filter(Boolean).join(" · ") + ` (no. ${c.id})`;
}

/**
 * Folds a customer entered twice into this one: the other customer's jobs, quotes, invoices,
 * accounts and invites move here and the other customer is removed. The duplicate is found by
 * typing (the server's customer search, so any customer of the shop can be picked) and picked
 * with the arrow keys and Enter, or a click. Asks for a tick first.
 */
export function MergeCustomerForm({ keepId, keepName }: { keepId: number; keepName: string }) {
  const [result, action, pending] = useActionState(mergeCustomerAction, null);
  const fields = result && !result.ok ? result.fields : undefined;
  const searchRef = useRef<HTMLInputElement>(null);
  const [search, setSearch] = useState("");
  const [chosen, setChosen] = useState<Customer | null>(null);
  const [confirmed, setConfirmed] = useState(false);

  const change = () => {
    setChosen(null);
    // The box comes back once the choice is dropped; the cursor goes into it.
    setTimeout(() => searchRef.current?.focus(), 0);
  };

  const errorId = "merge-remove-error";
  return (
    <form
      // Sent by hand rather than as the form's action: React empties a form after its action,
      // and a refusal (no tick, no customer) must leave the choice and the tick as they were.
      onSubmit={(e) => {
        e.preventDefault();
        const form = new FormData(e.currentTarget);
        startTransition(() => action(form));
      }}
      className="panel space-y-3 p-4"
      aria-label="Merge a duplicate"
    >
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
        {chosen ? (
          <p className="flex flex-wrap items-center gap-3" data-testid="merge-chosen">
            <input type="hidden" name="removeId" value={chosen.id} />
            <span className="font-semibold break-words">{labelOf(chosen)}</span>
            <button type="button" className="text-sm underline" onClick={change}>
              Change
            </button>
          </p>
        ) : (
          <CustomerPicker
            id="merge-remove"
            inputRef={searchRef}
            className="field-input w-full max-w-md"
            search={search}
            onSearch={setSearch}
            onPick={setChosen}
            excludeId={keepId}
            option={labelOf}
            nothingFound={(typed) => `No other customer matches “${typed}”.`}
            placeholder="Name, company, e-mail or phone"
            invalid={Boolean(fields?.removeId)}
            describedBy={fields?.removeId ? errorId : undefined}
          />
        )}
        {fields?.removeId ? (
          <p id={errorId} className="mt-1 text-sm text-replace">
            {fields.removeId}
          </p>
        ) : null}
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
