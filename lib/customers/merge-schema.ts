import { z } from "zod";

/** The merge request, shared by the customer page's form and the API: the customer to fold in. */
export const mergeCustomerSchema = z
  .object({
    removeId: z.coerce
      .number({ message: "Choose the customer to merge into this one." })
      .int("Choose the customer to merge into this one.")
      .positive("Choose the customer to merge into this one."),
  })
  .strict();
export type MergeCustomerInput = z.infer<typeof mergeCustomerSchema>;
