"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation, useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { type Resolver, useForm } from "react-hook-form";
import { z } from "zod";
import type { Customer } from "@/db/customers";
import { BROUGHT_ITEMS, type Job } from "@/db/jobs";
import { LAYOUT_PRESETS } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import { customerSchema } from "@/lib/validation/customers";
import { bookingSchema, jobSpecSchema } from "@/lib/validation/workshop";
import { BROUGHT_ITEM_LABEL } from "./brought-items";

// The booking form's own shape: the engine as typed (inches allowed), the items as a checklist.
const formSchema = z.object({
  engine: bookingSchema.shape.engine,
  notes: z.string().max(4000).optional(),
  layout: z.string().min(1, "Choose a layout."),
  // The settings' own rules and messages, so the counter reads what the server would say.
  cylinders: jobSpecSchema.shape.cylinders,
  rodsPerPin: jobSpecSchema.shape.rodsPerPin,
  bobweightNeeded: z.boolean().optional(),
  lengthUnit: z.enum(["mm", "in"]),
  bore: jobSpecSchema.shape.bore,
  stroke: jobSpecSchema.shape.stroke,
  rodLength: jobSpecSchema.shape.rodLength,
  maxRpm: jobSpecSchema.shape.maxRpm,
  condition: z.string().max(2000).optional(),
  promisedDate: jobSpecSchema.shape.promisedDate,
  items: z.record(
    z.string(),
    z.object({ brought: z.boolean(), quantity: z.string(), condition: z.string() }),
  ),
});
type Values = z.input<typeof formSchema>;
type Parsed = z.output<typeof formSchema>;

/** Booking a job in at the counter: who, what engine, what came in, what is asked, when promised. */
export function BookingForm() {
  const router = useRouter();
  const [search, setSearch] = useState("");
  const [customer, setCustomer] = useState<Customer | null>(null);
  const [creating, setCreating] = useState(false);
  const [newCustomer, setNewCustomer] = useState({ name: "", company: "", email: "", phone: "" });
  const [failure, setFailure] = useState<{
    message: string;
    fields: Record<string, string>;
  } | null>(null);

  const found = useQuery({
    queryKey: ["customers", search],
    queryFn: () =>
      apiFetch<{ customers: Customer[] }>(
        `/api/customers?pageSize=8&search=${encodeURIComponent(search)}`,
      ),
    enabled: search.trim().length > 0 && !customer,
  });

  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(formSchema) as unknown as Resolver<Values, unknown, Parsed>,
    defaultValues: {
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
  const preset = LAYOUT_PRESETS.find((p) => p.id === layout);

  const book = useMutation({
    mutationFn: async (v: Parsed) => {
      let customerId = customer?.id;
      if (!customerId) {
        const input = customerSchema.parse(newCustomer);
        customerId = (
          await apiFetch<{ customer: Customer }>("/api/customers", { method: "POST", body: input })
        ).customer.id;
      }
      const items = BROUGHT_ITEMS.filter((i) => v.items[i]?.brought).map((i) => ({
        item: i,
        quantity: Number(
          v.items[i]?.quantity ||
            (i === "crankshaft" || i === "flywheel" || i === "clutch" || i === "damper"
              ? 1
              : v.cylinders),
        ),
        condition: v.items[i]?.condition.trim() || null,
      }));
      const body = {
        customerId,
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
      return apiFetch<{ job: Job }>("/api/jobs", { method: "POST", body });
    },
    onSuccess: ({ job }) => router.push(`/jobs/${job.id}`),
    onError: (e) => {
      if (e instanceof ApiError) setFailure({ message: e.message, fields: e.fields });
      else if (e instanceof z.ZodError)
        setFailure({
          message: "The new customer needs a name.",
          fields: { name: e.issues[0]?.message ?? "" },
        });
      else setFailure({ message: "Not booked: the server could not be reached.", fields: {} });
    },
  });

  const errors = form.formState.errors;
  const fieldError = (key: string, local?: { message?: string }) => {
    const message = local?.message ?? failure?.fields[key] ?? failure?.fields[`spec.${key}`];
    return message ? <span className="mt-1 block text-xs text-replace">{message}</span> : null;
  };

  return (
    <form onSubmit={form.handleSubmit((v) => book.mutate(v))} className="space-y-6" noValidate>
      <section className="panel p-4" aria-labelledby="who">
        <h2 id="who" className="mb-3 font-semibold">
          Customer
        </h2>
        {customer ? (
          <p className="flex items-center gap-3">
            <span className="font-semibold">{customer.name}</span>
            {customer.company ? (
              <span className="text-graphite-500">{customer.company}</span>
            ) : null}
            <button type="button" className="text-sm underline" onClick={() => setCustomer(null)}>
              Change
            </button>
          </p>
        ) : creating ? (
          <div className="grid gap-3 sm:grid-cols-4">
            {(["name", "company", "email", "phone"] as const).map((k) => (
              <label key={k} className="text-sm">
                <span className="mb-1 block font-semibold capitalize">
                  {k === "email" ? "E-mail" : k}
                </span>
                <input
                  className="field-input"
                  value={newCustomer[k]}
                  onChange={(e) => setNewCustomer((c) => ({ ...c, [k]: e.target.value }))}
                  type={k === "email" ? "email" : "text"}
                />
                {fieldError(k)}
              </label>
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
            <input
              id="customer-search"
              className="field-input max-w-md"
              value={search}
              onChange={(e) => setSearch(e.target.value)}
              autoComplete="off"
            />
            <ul className="mt-2 max-w-md divide-y divide-graphite-100 rounded border border-graphite-200 bg-white empty:hidden">
              {found.data?.customers.map((c) => (
                <li key={c.id}>
                  <button
                    type="button"
                    className="w-full px-3 py-2 text-left hover:bg-brass-50"
                    onClick={() => setCustomer(c)}
                  >
                    <span className="font-semibold">{c.name}</span>{" "}
                    <span className="text-sm text-graphite-500">{c.company ?? c.email ?? ""}</span>
                  </button>
                </li>
              ))}
            </ul>
            <button type="button" className="btn-secondary mt-2" onClick={() => setCreating(true)}>
              New customer
            </button>
            {fieldError("customerId")}
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
        <label className="text-sm sm:col-span-2">
          <span className="mb-1 block font-semibold">Description</span>
          <input
            className="field-input"
            placeholder="e.g. cross-plane V8, 4.030 in bore"
            {...form.register("engine")}
          />
          {fieldError("engine", errors.engine)}
        </label>
        <label className="text-sm">
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
          {fieldError("layout", errors.layout)}
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-semibold">Cylinders</span>
          <input
            className="field-input"
            inputMode="numeric"
            readOnly={Boolean(preset?.cylinders)}
            {...form.register("cylinders")}
          />
          {fieldError("cylinders", errors.cylinders)}
        </label>
        {layout === "custom" ? (
          <>
            <label className="text-sm">
              <span className="mb-1 block font-semibold">Rods per crankpin</span>
              <input className="field-input" inputMode="numeric" {...form.register("rodsPerPin")} />
            </label>
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
          <label key={k} className="text-sm">
            <span className="mb-1 block font-semibold">{label}</span>
            <input className="field-input" inputMode="decimal" {...form.register(k)} />
            {fieldError(k)}
          </label>
        ))}
      </section>

      <section className="panel p-4" aria-labelledby="brought">
        <h2 id="brought" className="mb-3 font-semibold">
          What came in
        </h2>
        <div className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
          {BROUGHT_ITEMS.map((item) => (
            <div key={item} className="flex items-center gap-2 text-sm">
              <label className="flex w-40 items-center gap-2">
                <input type="checkbox" {...form.register(`items.${item}.brought`)} />
                {BROUGHT_ITEM_LABEL[item]}
              </label>
              <input
                className="w-14 rounded border border-graphite-300 px-2 py-1"
                aria-label={`${BROUGHT_ITEM_LABEL[item]} quantity`}
                placeholder="qty"
                inputMode="numeric"
                {...form.register(`items.${item}.quantity`)}
              />
              <input
                className="w-36 rounded border border-graphite-300 px-2 py-1"
                aria-label={`${BROUGHT_ITEM_LABEL[item]} condition`}
                placeholder="condition"
                {...form.register(`items.${item}.condition`)}
              />
            </div>
          ))}
        </div>
        <label className="mt-3 block text-sm">
          <span className="mb-1 block font-semibold">Condition notes</span>
          <textarea className="field-input" rows={2} {...form.register("condition")} />
        </label>
      </section>

      <section className="panel grid gap-3 p-4 sm:grid-cols-[1fr_14rem]" aria-labelledby="work">
        <h2 id="work" className="font-semibold sm:col-span-2">
          Work asked for
        </h2>
        <textarea
          className="field-input"
          rows={3}
          aria-label="Work asked for"
          {...form.register("notes")}
        />
        <label className="text-sm">
          <span className="mb-1 block font-semibold">Promised for</span>
          <input type="date" className="field-input" {...form.register("promisedDate")} />
          {fieldError("promisedDate")}
        </label>
      </section>

      <div className="flex items-center gap-4">
        <button type="submit" className="btn-primary" disabled={book.isPending}>
          {book.isPending ? "Booking in…" : "Book the job in"}
        </button>
        <p aria-live="polite" className="text-sm text-replace" data-testid="booking-message">
          {failure?.message}
        </p>
      </div>
    </form>
  );
}
