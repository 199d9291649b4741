"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db/client";
import { createCustomer, type Customer } from "@/db/customers";
import { checkAccess } from "@/lib/auth/guard";
import { type ActionResult, toActionFailure } from "@/lib/http/action-result";
import { formValues } from "@/lib/http/form-values";
import { customerSchema } from "@/lib/validation/customers";

export async function createCustomerAction(
  _prev: ActionResult<Customer> | null,
  form: FormData,
): Promise<ActionResult<Customer>> {
  const access = await checkAccess(["owner", "counter"]);
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
