"use client";

import { useActionState, useEffect, useRef, useState } from "react";
import { createCustomerAction } from "@/app/(shop)/customers/actions";
import { ActionMessage, Field } from "@/components/ui/field";

type Box = "name" | "company" | "email" | "phone" | "address";
type Values = Record<Box, string>;

const EMPTY: Values = { name: "", company: "", email: "", phone: "", address: "" };
const BOXES: Box[] = ["name", "company", "email", "phone", "address"];

/**
 * A new customer at the counter. The boxes hold what was typed (controlled), so a refusal keeps
 * the typing, marks the box the server names and puts the cursor in the first one; once the
 * customer is added the boxes empty for the next one.
 */
export function AddCustomerForm() {
  const [result, action, pending] = useActionState(createCustomerAction, null);
  const [values, setValues] = useState<Values>(EMPTY);
  const formRef = useRef<HTMLFormElement>(null);
  const fields = result && !result.ok ? result.fields : undefined;

  // Acted on once per answer: a customer added empties the boxes; a refusal focuses its box.
  const [seen, setSeen] = useState(result);
  if (result !== seen) {
    setSeen(result);
    if (result?.ok) setValues(EMPTY);
  }
  useEffect(() => {
    const first = BOXES.find((b) => fields?.[b]);
    if (first) formRef.current?.querySelector<HTMLInputElement>(`[name="${first}"]`)?.focus();
  }, [fields]);

  const box = (name: Box) => ({
    name,
    value: values[name],
    onChange: (e: { target: { value: string } }) =>
      setValues((v) => ({ ...v, [name]: e.target.value })),
    error: fields?.[name],
  });
  return (
    <form ref={formRef} action={action} className="panel grid gap-3 p-4 sm:grid-cols-2">
      <h2 className="font-semibold sm:col-span-2">New customer</h2>
      <Field label="Name" required {...box("name")} />
      <Field label="Company" {...box("company")} />
      <Field label="E-mail" type="email" {...box("email")} />
      <Field label="Phone" type="tel" {...box("phone")} />
      <div className="sm:col-span-2">
        <Field label="Address" {...box("address")} />
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
