"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { redirect } from "next/navigation";
import { getDb } from "@/db/client";
import { NotFoundError } from "@/db/errors";
import type { Customer } from "@/db/customers";
import { createCustomer, updateCustomer } from "@/lib/customers/manage";
import { checkPermission } from "@/lib/auth/guard";
import { mergeCustomers } from "@/lib/customers/merge";
import { mergeCustomerSchema } from "@/lib/customers/merge-schema";
import { type ActionResult, toActionFailure } from "@/lib/http/action-result";
import { formValues } from "@/lib/http/form-values";
import { customerSchema } from "@/lib/validation/customers";

export async function createCustomerAction(
  _prev: ActionResult<Customer> | null,
  form: FormData,
): Promise<ActionResult<Customer>> {
  const access = await checkPermission("manage-customers");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const input = customerSchema.parse(formValues(form));
    const customer = await createCustomer(getDb(), input, access.user.id);
    revalidatePath("/customers");
    return { ok: true, data: customer, message: `${customer.name} added.` };
  } catch (error) {
    return toActionFailure(error);
  }
}

const customerIdField = z.coerce.number().int().positive();

/** The customer a form is about, from its hidden `customerId` box. */
function customerIdOf(form: FormData): number {
  const parsed = customerIdField.safeParse(form.get("customerId") ?? undefined);
  if (!parsed.success) throw new NotFoundError("customer");
  return parsed.data;
}

/** Saves a customer's details from their page (the customer named by the hidden `customerId`). */
export async function updateCustomerAction(
  _prev: ActionResult<Customer> | null,
  form: FormData,
): Promise<ActionResult<Customer>> {
  const access = await checkPermission("manage-customers");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const { customerId: _id, ...values } = formValues(form);
    const input = customerSchema.parse(values);
    const id = customerIdOf(form);
    const customer = await updateCustomer(getDb(), id, input, access.user.id);
    revalidatePath("/customers");
    revalidatePath(`/customers/${id}`);
    return { ok: true, data: customer, message: "Details saved." };
  } catch (error) {
    return toActionFailure(error);
  }
}

/**
 * Merges the chosen customer (`removeId`) into the one whose page this is (the hidden
 * `customerId`), then shows the kept customer.
 */
export async function mergeCustomerAction(
  _prev: ActionResult<undefined> | null,
  form: FormData,
): Promise<ActionResult<undefined>> {
  const access = await checkPermission("manage-customers");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  let keepId: number;
  try {
    if (form.get("confirm") !== "yes") {
      return {
        ok: false,
        status: 422,
        message: "Tick the box to confirm the merge.",
        fields: { confirm: "Tick the box to confirm the merge." },
      };
    }
    const { removeId } = mergeCustomerSchema.parse({ removeId: form.get("removeId") || undefined });
    keepId = customerIdOf(form);
    await mergeCustomers(getDb(), keepId, removeId, access.user.id);
    revalidatePath("/customers");
  } catch (error) {
    return toActionFailure(error);
  }
  redirect(`/customers/${keepId}?merged=1`);
}
