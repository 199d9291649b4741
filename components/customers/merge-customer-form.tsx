"use client";

import { startTransition, useActionState, useEffect, useId, useRef, useState } from "react";
import { mergeCustomerAction } from "@/app/(shop)/customers/actions";
import { ActionMessage } from "@/components/ui/field";
import type { Customer } from "@/db/customers";
import { apiFetch } from "@/lib/api-client";

/** How a customer reads in the picker: name, company, e-mail and the shop's number for them. */
function labelOf(c: Customer): string {
  return [c.name, c.company, c.email].filter(Boolean).join(" · ") + ` (no. ${c.id})`;
}

// The search waits this long after the last key before asking the server.
const SEARCH_PAUSE_MS = 150;

type Found =
  | { state: "idle" }
  | { state: "searching"; search: string }
  | { state: "done"; search: string; customers: Customer[] }
  | { state: "failed"; search: string; message: string };

/**
 * Folds a customer entered twice into this one: the other customer's jobs, quotes, invoices,
 * accounts and invites move here and the other customer is removed. The duplicate is found by
 * typing (the server's customer search, so any customer of the shop can be picked) and picked
 * with the arrow keys and Enter, or a click. Asks for a tick first.
 */
export function MergeCustomerForm({ keepId, keepName }: { keepId: number; keepName: string }) {
  const [result, action, pending] = useActionState(mergeCustomerAction, null);
  const fields = result && !result.ok ? result.fields : undefined;
  const listId = useId();
  const searchRef = useRef<HTMLInputElement>(null);
  const [search, setSearch] = useState("");
  const [chosen, setChosen] = useState<Customer | null>(null);
  const [active, setActive] = useState(-1);
  const [found, setFound] = useState<Found>({ state: "idle" });
  const [confirmed, setConfirmed] = useState(false);

  useEffect(() => {
    const typed = search.trim();
    if (chosen || typed === "") return;
    let current = true;
    const timer = setTimeout(() => {
      setFound({ state: "searching", search: typed });
      apiFetch<{ customers: Customer[] }>(
        `/api/customers?pageSize=8&search=${encodeURIComponent(typed)}`,
      ).then(
        ({ customers }) => {
          if (current)
            setFound({
              state: "done",
              search: typed,
              customers: customers.filter((c) => c.id !== keepId),
            });
        },
        (error: unknown) => {
          if (current)
            setFound({
              state: "failed",
              search: typed,
              message: error instanceof Error ? error.message : "The search failed.",
            });
        },
      );
    }, SEARCH_PAUSE_MS);
    return () => {
      current = false;
      clearTimeout(timer);
    };
  }, [search, chosen, keepId]);

  const typed = search.trim();
  const options =
    !chosen && typed !== "" && found.state === "done" && found.search === typed
      ? found.customers
      : [];

  const pick = (c: Customer) => {
    setChosen(c);
    setActive(-1);
  };
  const change = () => {
    setChosen(null);
    setActive(-1);
    // The box comes back once the choice is dropped; the cursor goes into it.
    setTimeout(() => searchRef.current?.focus(), 0);
  };

  const onSearchKey = (e: React.KeyboardEvent<HTMLInputElement>) => {
    if (e.key === "ArrowDown" && options.length) {
      e.preventDefault();
      setActive((a) => (a + 1) % options.length);
    } else if (e.key === "ArrowUp" && options.length) {
      e.preventDefault();
      setActive((a) => (a <= 0 ? options.length - 1 : a - 1));
    } else if (e.key === "Enter") {
      // Enter in the search picks the highlighted customer; it never sends the merge.
      e.preventDefault();
      const picked = options[active] ?? (options.length === 1 ? options[0] : undefined);
      if (picked) pick(picked);
    } else if (e.key === "Escape") {
      setActive(-1);
    }
  };

  const errorId = `${listId}-error`;
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
          <>
            <input
              id="merge-remove"
              ref={searchRef}
              className="field-input w-full max-w-md"
              role="combobox"
              aria-expanded={options.length > 0}
              aria-controls={listId}
              aria-autocomplete="list"
              aria-activedescendant={active >= 0 ? `${listId}-${active}` : undefined}
              aria-invalid={fields?.removeId ? true : undefined}
              aria-describedby={fields?.removeId ? errorId : undefined}
              placeholder="Name, company, e-mail or phone"
              value={search}
              onChange={(e) => {
                setSearch(e.target.value);
                setActive(-1);
              }}
              onKeyDown={onSearchKey}
              autoComplete="off"
            />
            <ul
              id={listId}
              role="listbox"
              aria-label="Customers found"
              className="mt-2 max-w-md divide-y divide-graphite-100 rounded border border-graphite-200 bg-white empty:hidden"
            >
              {options.map((c, index) => (
                <li
                  key={c.id}
                  id={`${listId}-${index}`}
                  role="option"
                  aria-selected={index === active}
                  className={`cursor-pointer px-3 py-2 break-words ${index === active ? "bg-brass-100" : "hover:bg-brass-50"}`}
                  onMouseDown={(e) => e.preventDefault()}
                  onClick={() => pick(c)}
                >
                  {labelOf(c)}
                </li>
              ))}
            </ul>
            <div aria-live="polite" className="text-sm text-graphite-600">
              {typed !== "" && found.state === "done" && found.search === typed && !options.length
                ? `No other customer matches “${typed}”.`
                : typed !== "" && found.state === "failed" && found.search === typed
                  ? `Not searched: ${found.message}`
                  : null}
            </div>
          </>
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
