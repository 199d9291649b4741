"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { type FieldErrors, type Resolver, useForm } from "react-hook-form";
import { z } from "zod";
import { CustomerPicker } from "@/components/customers/customer-picker";
import type { Customer } from "@/db/customers";
import { type BroughtItem, BROUGHT_ITEMS, type Job } from "@/db/jobs";
import { LAYOUT_PRESETS } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import { shopToday } from "@/lib/dates/shop-time";
import { customerSchema } from "@/lib/validation/customers";
import {
  bookingEngineField,
  bookingNotesField,
  bookingSchema,
  jobSpecSchema,
} from "@/lib/validation/workshop";
import { BROUGHT_ITEM_LABEL } from "./brought-items";

/** Parts counted one to an engine; the rest default to one per cylinder. */
const ONE_PER_ENGINE: readonly BroughtItem[] = ["crankshaft", "flywheel", "clutch", "damper"];
const WHOLE = /^\s*\d{1,2}\s*$/;
const CUSTOMER_BOX = { name: "Name", company: "Company", email: "E-mail", phone: "Phone" } as const;

// The booking form's own shape: the engine as typed (inches allowed), the items as a checklist.
// Every rule and message is the server's (lib/validation/workshop.ts, customers.ts), so a box is
// refused here in the same words the server would use.
export const bookingFormSchema = z
  .object({
    customerId: z.number().int().positive().optional(),
    creating: z.boolean(),
    newCustomer: z.object({
      name: z.string(),
      company: z.string(),
      email: z.string(),
      phone: z.string(),
    }),
    engine: bookingEngineField,
    notes: bookingNotesField.optional(),
    layout: z.string().min(1, "Layout: choose one from the list."),
    cylinders: jobSpecSchema.shape.cylinders,
    rodsPerPin: jobSpecSchema.shape.rodsPerPin,
    bobweightNeeded: z.boolean().optional(),
    lengthUnit: z.enum(["mm", "in"]),
    bore: jobSpecSchema.shape.bore,
    stroke: jobSpecSchema.shape.stroke,
    rodLength: jobSpecSchema.shape.rodLength,
    maxRpm: jobSpecSchema.shape.maxRpm,
    condition: jobSpecSchema.shape.condition,
    promisedDate: jobSpecSchema.shape.promisedDate,
    items: z.record(
      z.string(),
      z.object({ brought: z.boolean(), quantity: z.string(), condition: z.string() }),
    ),
  })
  .superRefine((v, ctx) => {
    if (v.creating) {
      const parsed = customerSchema
        .pick({ name: true, company: true, email: true, phone: true })
        .safeParse(v.newCustomer);
      if (!parsed.success)
        for (const issue of parsed.error.issues)
          ctx.addIssue({
            code: "custom",
            path: ["newCustomer", ...issue.path.map(String)],
            message: issue.message,
          });
    } else if (v.customerId === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["customerId"],
        message: "Customer: choose one from the search, or add a new one.",
      });
    }
    for (const item of BROUGHT_ITEMS) {
      const row = v.items[item];
      if (!row?.brought || row.quantity.trim() === "") continue;
      const n = WHOLE.test(row.quantity) ? Number(row.quantity) : NaN;
      if (!(n >= 1 && n <= 64))
        ctx.addIssue({
          code: "custom",
          path: ["items", item, "quantity"],
          message: `${BROUGHT_ITEM_LABEL[item]}: a whole number from 1 to 64, like 8.`,
        });
    }
  });
type Values = z.input<typeof bookingFormSchema>;
type Parsed = z.output<typeof bookingFormSchema>;

/** The request body the form sends for what was typed (one function, tested on its own). */
export function bookingBody(v: Parsed): z.input<typeof bookingSchema> {
  const items = BROUGHT_ITEMS.filter((i) => v.items[i]?.brought).map((i) => ({
    item: i,
    quantity: v.items[i]?.quantity.trim() || (ONE_PER_ENGINE.includes(i) ? 1 : v.cylinders),
    condition: v.items[i]?.condition.trim() || null,
  }));
  return {
    ...(v.creating ? { customer: v.newCustomer } : { customerId: v.customerId }),
    engine: v.engine,
    notes: v.notes?.trim() || null,
    spec: {
      layout: v.layout,
      cylinders: v.cylinders,
      ...(v.layout === "custom"
        ? { rodsPerPin: v.rodsPerPin ?? 1, bobweightNeeded: v.bobweightNeeded ?? true }
        : {}),
      // Kept as typed in the unit chosen; the server works out the mm for the engine.
      lengthUnit: v.lengthUnit,
      bore: v.bore ?? null,
      stroke: v.stroke ?? null,
      rodLength: v.rodLength ?? null,
      maxRpm: v.maxRpm ?? null,
      condition: v.condition?.trim() || null,
      promisedDate: v.promisedDate ?? null,
      items,
    },
  };
}

/** Today on this computer's calendar, as YYYY-MM-DD. */
function localToday(now = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

/** A server refusal's field ("spec.bore", "customer.name", "spec.items.0.quantity") as the box. */
function boxOf(key: string, sentItems: BroughtItem[]): string {
  const item = /^spec\.items\.(\d+)\.(\w+)$/.exec(key);
  if (item) return `items.${sentItems[Number(item[1])] ?? "?"}.${item[2]}`;
  if (key.startsWith("customer.")) return `newCustomer.${key.slice("customer.".length)}`;
  return key.replace(/^spec\./, "");
}

/** The id of the refusal shown under a box, for the box's aria-describedby. */
function errorId(key: string): string {
  return `booking-error-${key.replace(/\./g, "-")}`;
}

function countErrors(errors: FieldErrors): number {
  let n = 0;
  for (const value of Object.values(errors)) {
    if (!value) continue;
    if (typeof (value as { message?: unknown }).message === "string") n += 1;
    else n += countErrors(value as FieldErrors);
  }
  return n;
}

/** Booking a job in at the counter: who, what engine, what came in, what is asked, when promised. */
export function BookingForm({ timeZone }: { timeZone?: string } = {}) {
  const router = useRouter();
  const [search, setSearch] = useState("");
  const [customer, setCustomer] = useState<Customer | null>(null);
  const [pastConfirmed, setPastConfirmed] = useState<string | null>(null);
  const [askPast, setAskPast] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const [serverFields, setServerFields] = useState<Record<string, string>>({});

  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(bookingFormSchema) as unknown as Resolver<Values, unknown, Parsed>,
    defaultValues: {
      creating: false,
      newCustomer: { name: "", company: "", email: "", phone: "" },
      engine: "",
      layout: "v8-cross-plane",
      cylinders: 8,
      lengthUnit: "mm",
      items: Object.fromEntries(
        BROUGHT_ITEMS.map((i) => [i, { brought: false, quantity: "", condition: "" }]),
      ),
    },
  });
  const layout = form.watch("layout");
  const [creating, setCreatingState] = useState(false);
  const setCreating = (value: boolean) => {
    setCreatingState(value);
    form.setValue("creating", value);
  };
  const preset = LAYOUT_PRESETS.find((p) => p.id === layout);

  const book = useMutation({
    mutationFn: async (body: ReturnType<typeof bookingBody>) =>
      apiFetch<{ job: Job }>("/api/jobs", { method: "POST", body }),
    onSuccess: ({ job }) => router.push(`/jobs/${job.id}`),
    onError: (e, body) => {
      if (e instanceof ApiError) {
        const sent = (body.spec.items ?? []).map((i) => i.item as BroughtItem);
        const fields = Object.fromEntries(
          Object.entries(e.fields).map(([k, m]) => [boxOf(k, sent), m]),
        );
        setServerFields(fields);
        const count = Object.keys(fields).length;
        setFailure(
          count > 0
            ? `Not booked: ${count === 1 ? "one box needs" : `${count} boxes need`} attention. ${e.message}`
            : `Not booked: ${e.message}`,
        );
      } else {
        setFailure(
          "Not booked: the server could not be reached. Nothing was saved; try again when the connection is back.",
        );
      }
    },
  });

  const submit = form.handleSubmit(
    (v) => {
      setServerFields({});
      if (
        v.promisedDate &&
        v.promisedDate < (timeZone ? shopToday(timeZone) : localToday()) &&
        pastConfirmed !== v.promisedDate
      ) {
        setAskPast(v.promisedDate);
        setFailure(null);
        return;
      }
      setAskPast(null);
      setFailure(null);
      book.mutate(bookingBody(v));
    },
    (errors) => {
      const count = countErrors(errors);
      setFailure(
        `Not booked: ${count === 1 ? "one box needs" : `${count} boxes need`} attention (marked below).`,
      );
    },
  );

  const errors = form.formState.errors;
  const fieldError = (key: string, local?: { message?: string }) => {
    const message = local?.message ?? serverFields[key];
    return message ? (
      <span className="mt-1 block text-xs text-replace" role="alert" id={errorId(key)}>
        {message}
      </span>
    ) : null;
  };

  const pick = (c: Customer) => {
    setCustomer(c);
    form.setValue("customerId", c.id, { shouldValidate: form.formState.isSubmitted });
  };

  return (
    <form onSubmit={submit} className="space-y-6" noValidate>
      <section className="panel p-4" aria-labelledby="who">
        <h2 id="who" className="mb-3 font-semibold">
          Customer
        </h2>
        {customer ? (
          <p className="flex items-center gap-3" data-testid="chosen-customer">
            <span className="font-semibold">{customer.name}</span>
            {customer.company ? (
              <span className="text-graphite-500">{customer.company}</span>
            ) : null}
            <button
              type="button"
              className="text-sm underline"
              onClick={() => {
                setCustomer(null);
                form.setValue("customerId", undefined);
              }}
            >
              Change
            </button>
          </p>
        ) : creating ? (
          <div className="grid gap-3 sm:grid-cols-4">
            {(["name", "company", "email", "phone"] as const).map((k) => (
              <div key={k} className="text-sm">
                <label className="block">
                  <span className="mb-1 block font-semibold">{CUSTOMER_BOX[k]}</span>
                  <input
                    className="field-input"
                    type={k === "email" ? "email" : k === "phone" ? "tel" : "text"}
                    aria-describedby={errorId(`newCustomer.${k}`)}
                    aria-invalid={Boolean(
                      errors.newCustomer?.[k] ?? serverFields[`newCustomer.${k}`],
                    )}
                    {...form.register(`newCustomer.${k}`)}
                  />
                </label>
                {fieldError(`newCustomer.${k}`, errors.newCustomer?.[k])}
              </div>
            ))}
            <button
              type="button"
              className="text-left text-sm underline"
              onClick={() => setCreating(false)}
            >
              Find an existing customer instead
            </button>
          </div>
        ) : (
          <div>
            <label className="text-sm" htmlFor="customer-search">
              <span className="mb-1 block font-semibold">
                Find by name, company, e-mail or phone
              </span>
            </label>
            {/* Enter in the search picks the highlighted customer; it never books the job. */}
            <CustomerPicker
              id="customer-search"
              search={search}
              onSearch={setSearch}
              onPick={pick}
              option={(c) => (
                <>
                  <span className="font-semibold">{c.name}</span>{" "}
                  <span className="text-sm text-graphite-500">{c.company ?? c.email ?? ""}</span>
                </>
              )}
              invalid={Boolean(errors.customerId ?? serverFields.customerId)}
              describedBy={errorId("customerId")}
            />
            <button type="button" className="btn-secondary mt-2" onClick={() => setCreating(true)}>
              New customer
            </button>
            {fieldError("customerId", errors.customerId)}
          </div>
        )}
      </section>

      <section
        className="panel grid gap-3 p-4 sm:grid-cols-2 lg:grid-cols-4"
        aria-labelledby="engine"
      >
        <h2 id="engine" className="font-semibold sm:col-span-2 lg:col-span-4">
          Engine
        </h2>
        <div className="text-sm sm:col-span-2">
          <label className="block">
            <span className="mb-1 block font-semibold">Description</span>
            <input
              className="field-input"
              placeholder="e.g. cross-plane V8, 4.030 in bore"
              aria-describedby={errorId("engine")}
              aria-invalid={Boolean(errors.engine ?? serverFields.engine)}
              {...form.register("engine")}
            />
          </label>
          {fieldError("engine", errors.engine)}
        </div>
        <div className="text-sm">
          <label className="block">
            <span className="mb-1 block font-semibold">Layout</span>
            <select
              className="field-input"
              {...form.register("layout", {
                onChange: (e) => {
                  const p = LAYOUT_PRESETS.find((x) => x.id === e.target.value);
                  if (p?.cylinders) form.setValue("cylinders", p.cylinders);
                },
              })}
            >
              {LAYOUT_PRESETS.filter((p) => !("replacedBy" in p && p.replacedBy)).map((p) => (
                <option key={p.id} value={p.id}>
                  {p.label}
                </option>
              ))}
            </select>
          </label>
          {fieldError("layout", errors.layout)}
        </div>
        <div className="text-sm">
          <label className="block">
            <span className="mb-1 block font-semibold">Cylinders</span>
            <input
              className="field-input"
              inputMode="numeric"
              readOnly={Boolean(preset?.cylinders)}
              aria-describedby={errorId("cylinders")}
              aria-invalid={Boolean(errors.cylinders ?? serverFields.cylinders)}
              {...form.register("cylinders")}
            />
          </label>
          {fieldError("cylinders", errors.cylinders)}
        </div>
        {layout === "custom" ? (
          <>
            <div className="text-sm">
              <label className="block">
                <span className="mb-1 block font-semibold">Rods per crankpin</span>
                <input
                  className="field-input"
                  inputMode="numeric"
                  {...form.register("rodsPerPin")}
                />
              </label>
              {fieldError("rodsPerPin", errors.rodsPerPin)}
            </div>
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" {...form.register("bobweightNeeded")} defaultChecked />
              Balanced with bobweights
            </label>
          </>
        ) : null}
        <fieldset className="flex items-end gap-3 text-sm">
          <legend className="mb-1 font-semibold">Lengths in</legend>
          <label className="flex items-center gap-1">
            <input type="radio" value="mm" {...form.register("lengthUnit")} /> mm
          </label>
          <label className="flex items-center gap-1">
            <input type="radio" value="in" {...form.register("lengthUnit")} /> inches
          </label>
        </fieldset>
        {(
          [
            ["bore", "Bore"],
            ["stroke", "Stroke"],
            ["rodLength", "Rod length (centres)"],
            ["maxRpm", "Max service rpm"],
          ] as const
        ).map(([k, label]) => (
          <div key={k} className="text-sm">
            <label className="block">
              <span className="mb-1 block font-semibold">{label}</span>
              <input
                className="field-input"
                inputMode={k === "maxRpm" ? "numeric" : "decimal"}
                aria-describedby={errorId(k)}
                aria-invalid={Boolean(errors[k] ?? serverFields[k])}
                {...form.register(k)}
              />
            </label>
            {fieldError(k, errors[k])}
          </div>
        ))}
      </section>

      <section className="panel p-4" aria-labelledby="brought">
        <h2 id="brought" className="mb-3 font-semibold">
          What came in
        </h2>
        <div className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
          {BROUGHT_ITEMS.map((item) => {
            const qty = errors.items?.[item]?.quantity;
            return (
              <div key={item} className="min-w-0 text-sm">
                <div className="flex items-center gap-2">
                  <label className="flex w-40 items-center gap-2">
                    <input type="checkbox" {...form.register(`items.${item}.brought`)} />
                    {BROUGHT_ITEM_LABEL[item]}
                  </label>
                  <input
                    className="w-14 rounded border border-graphite-300 px-2 py-1"
                    aria-label={`${BROUGHT_ITEM_LABEL[item]} quantity`}
                    aria-describedby={errorId(`items.${item}.quantity`)}
                    aria-invalid={Boolean(qty ?? serverFields[`items.${item}.quantity`])}
                    placeholder="qty"
                    inputMode="numeric"
                    {...form.register(`items.${item}.quantity`)}
                  />
                  <input
                    className="w-36 min-w-0 rounded border border-graphite-300 px-2 py-1"
                    aria-label={`${BROUGHT_ITEM_LABEL[item]} condition`}
                    placeholder="condition"
                    {...form.register(`items.${item}.condition`)}
                  />
                </div>
                {fieldError(`items.${item}.quantity`, qty)}
                {fieldError(`items.${item}.condition`, errors.items?.[item]?.condition)}
              </div>
            );
          })}
        </div>
        <div className="mt-3 block text-sm">
          <label className="block">
            <span className="mb-1 block font-semibold">Condition notes</span>
            <textarea className="field-input" rows={2} {...form.register("condition")} />
          </label>
          {fieldError("condition", errors.condition)}
        </div>
      </section>

      <section className="panel grid gap-3 p-4 sm:grid-cols-[1fr_14rem]" aria-labelledby="work">
        <h2 id="work" className="font-semibold sm:col-span-2">
          Work asked for
        </h2>
        <div>
          <textarea
            className="field-input"
            rows={3}
            aria-label="Work asked for"
            {...form.register("notes")}
          />
          {fieldError("notes", errors.notes)}
        </div>
        <div className="text-sm">
          <label className="block">
            <span className="mb-1 block font-semibold">Promised for</span>
            <input
              type="date"
              className="field-input"
              aria-describedby={errorId("promisedDate")}
              aria-invalid={Boolean(errors.promisedDate ?? serverFields.promisedDate)}
              {...form.register("promisedDate", { onChange: () => setAskPast(null) })}
            />
          </label>
          {fieldError("promisedDate", errors.promisedDate)}
        </div>
      </section>

      {askPast ? (
        <div
          className="panel border-amber-400 bg-amber-50 p-4 text-sm"
          role="alertdialog"
          aria-labelledby="past-date"
          data-testid="past-date"
        >
          <p id="past-date" className="font-semibold">
            The promised date {askPast} is already past. Book the job with this date anyway?
          </p>
          <div className="mt-2 flex gap-3">
            <button
              type="button"
              className="btn-primary"
              onClick={() => {
                setPastConfirmed(askPast);
                setAskPast(null);
                void submitAfterConfirm();
              }}
            >
              Book with {askPast}
            </button>
            <button
              type="button"
              className="btn-secondary"
              onClick={() => {
                setAskPast(null);
                form.setFocus("promisedDate");
              }}
            >
              Change the date
            </button>
          </div>
        </div>
      ) : null}

      <div className="flex items-center gap-4">
        <button type="submit" className="btn-primary" disabled={book.isPending}>
          {book.isPending ? "Booking in…" : "Book the job in"}
        </button>
        <p aria-live="polite" className="text-sm text-replace" data-testid="booking-message">
          {failure}
        </p>
      </div>
    </form>
  );

  /** Books after the counter confirmed a past promised date (the state update is not yet read). */
  async function submitAfterConfirm() {
    await form.handleSubmit((v) => {
      setFailure(null);
      book.mutate(bookingBody(v));
    })();
  }
}
