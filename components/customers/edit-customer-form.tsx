"use client";

import { useActionState, useState } from "react";
import { updateCustomerAction } from "@/app/(shop)/customers/actions";
import type { Customer } from "@/db/customers";
import { ActionMessage, Field } from "@/components/ui/field";

type Values = Record<"name" | "company" | "email" | "phone" | "address" | "notes", string>;

const valuesOf = (c: Customer): Values => ({
  name: c.name,
  company: c.company ?? "",
  email: c.email ?? "",
  phone: c.phone ?? "",
  address: c.address ?? "",
  notes: c.notes ?? "",
});

/**
 * The customer's details, editable by the counter and the owner. The boxes hold what was typed
 * (controlled), so a refusal keeps the machinist's typing rather than resetting the form.
 */
export function EditCustomerForm({ customer }: { customer: Customer }) {
  const [result, action, pending] = useActionState(updateCustomerAction, null);
  const [values, setValues] = useState<Values>(() => valuesOf(customer));
  const fields = result && !result.ok ? result.fields : undefined;
  const box = (name: keyof Values) => ({
    name,
    value: values[name],
    onChange: (e: { target: { value: string } }) =>
      setValues((v) => ({ ...v, [name]: e.target.value })),
    error: fields?.[name],
  });
  return (
    <form action={action} className="panel grid gap-3 p-4 sm:grid-cols-2" aria-label="Details">
      <h2 className="font-semibold sm:col-span-2">Details</h2>
      <input type="hidden" name="customerId" value={customer.id} />
      <Field label="Name" required {...box("name")} />
      <Field label="Company" {...box("company")} />
      <Field label="E-mail" type="email" {...box("email")} />
      <Field label="Phone" type="tel" {...box("phone")} />
      <div className="sm:col-span-2">
        <Field label="Address" {...box("address")} />
      </div>
      <div className="sm:col-span-2">
        <label htmlFor="field-notes" className="mb-1 block text-sm font-semibold">
          Notes
        </label>
        <textarea
          id="field-notes"
          name="notes"
          rows={3}
          value={values.notes}
          onChange={(e) => setValues((v) => ({ ...v, notes: e.target.value }))}
          className="field-input w-full"
          aria-invalid={fields?.notes ? true : undefined}
        />
        {fields?.notes ? <p className="mt-1 text-sm text-replace">{fields.notes}</p> : null}
      </div>
      <div className="flex flex-wrap items-center gap-4 sm:col-span-2">
        <button className="btn-primary" type="submit" disabled={pending}>
          Save details
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
