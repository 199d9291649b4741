"use client";

import { type ReactNode, type Ref, useEffect, useId, useState } from "react";
import type { Customer } from "@/db/customers";
import { apiFetch } from "@/lib/api-client";

// The search waits this long after the last key before asking the server.
const SEARCH_PAUSE_MS = 150;

type Found =
  | { state: "idle" }
  | { state: "searching"; search: string }
  | { state: "done"; search: string; customers: Customer[] }
  | { state: "failed"; search: string; message: string };

/**
 * The one search-as-you-type box for choosing a customer (booking a job, merging a duplicate):
 * asks the server's customer search (so any customer of the shop can be found, not only a first
 * page) a moment after the last key, lists what it finds, and picks with the arrow keys and Enter
 * or a click. Enter in the box only ever picks: it never sends the form around it. Escape drops
 * the highlight. The label is the screen's own (`<label htmlFor={id}>`), as is what it shows once
 * a customer is picked; what was typed is the screen's too, so it is still there after "Change".
 */
export function CustomerPicker({
  id,
  search,
  onSearch,
  onPick,
  excludeId,
  option = (c) => c.name,
  nothingFound = () => "No customer found.",
  placeholder,
  invalid = false,
  describedBy,
  inputRef,
  className = "field-input max-w-md",
}: {
  /** The box's id, for the screen's label. */
  id: string;
  /** What is typed in the box. */
  search: string;
  onSearch: (search: string) => void;
  onPick: (customer: Customer) => void;
  /** A customer never offered (the one being merged into). */
  excludeId?: number;
  /** How a customer found reads in the list. */
  option?: (customer: Customer) => ReactNode;
  /** What is said when the search finds no one, given what was typed. */
  nothingFound?: (typed: string) => string;
  placeholder?: string;
  /** The screen has a refusal for this box. */
  invalid?: boolean;
  /** The id of the screen's refusal text for this box. */
  describedBy?: string;
  inputRef?: Ref<HTMLInputElement>;
  className?: string;
}) {
  const listId = useId();
  const [active, setActive] = useState(-1);
  const [found, setFound] = useState<Found>({ state: "idle" });
  const typed = search.trim();

  useEffect(() => {
    if (typed === "") return;
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
              customers: customers.filter((c) => c.id !== excludeId),
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
  }, [typed, excludeId]);

  const options =
    typed !== "" && found.state === "done" && found.search === typed ? found.customers : [];

  const pick = (c: Customer) => {
    setActive(-1);
    onPick(c);
  };

  const onKeyDown = (e: React.KeyboardEvent<HTMLInputElement>) => {
    if (e.key === "ArrowDown" && options.length) {
      e.preventDefault();
      setActive((a) => (a + 1) % options.length);
    } else if (e.key === "ArrowUp" && options.length) {
      e.preventDefault();
      setActive((a) => (a <= 0 ? options.length - 1 : a - 1));
    } else if (e.key === "Enter") {
      // Enter in the search picks the highlighted customer; it never sends the form.
      e.preventDefault();
      const picked = options[active] ?? (options.length === 1 ? options[0] : undefined);
      if (picked) pick(picked);
    } else if (e.key === "Escape") {
      setActive(-1);
    }
  };

  return (
    <>
      <input
        id={id}
        ref={inputRef}
        className={className}
        role="combobox"
        aria-expanded={options.length > 0}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={active >= 0 ? `${listId}-${active}` : undefined}
        aria-invalid={invalid ? true : undefined}
        aria-describedby={describedBy}
        placeholder={placeholder}
        value={search}
        onChange={(e) => {
          onSearch(e.target.value);
          setActive(-1);
        }}
        onKeyDown={onKeyDown}
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
            {option(c)}
          </li>
        ))}
      </ul>
      <div aria-live="polite" className="text-sm text-graphite-600">
        {typed !== "" && found.state === "done" && found.search === typed && !options.length
          ? nothingFound(typed)
          : typed !== "" && found.state === "failed" && found.search === typed
            ? `Not searched: ${found.message}`
            : null}
      </div>
    </>
  );
}
