"use client";

import { useActionState } from "react";
import { createCustomerAction } from "@/app/(shop)/customers/actions";
import { ActionMessage, Field } from "@/components/ui/field";

export function AddCustomerForm() {
  const [result, action, pending] = useActionState(createCustomerAction, null);
  const fields = result && !result.ok ? result.fields : undefined;
  return (
    <form
      action={action}
      className="panel grid gap-3 p-4 sm:grid-cols-2"
      key={result?.ok ? result.data.id : "new"}
    >
      <h2 className="font-semibold sm:col-span-2">New customer</h2>
      <Field label="Name" name="name" required error={fields?.name} />
      <Field label="Company" name="company" error={fields?.company} />
      <Field label="E-mail" name="email" type="email" error={fields?.email} />
      <Field label="Phone" name="phone" type="tel" error={fields?.phone} />
      <div className="sm:col-span-2">
        <Field label="Address" name="address" error={fields?.address} />
      </div>
      <div className="flex items-center gap-4 sm:col-span-2">
        <button className="btn-primary" type="submit" disabled={pending}>
          Add customer
        </button>
        <ActionMessage result={result} />
      </div>
    </form>
  );
}
