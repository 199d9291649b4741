/**
 * Input the billing rules refuse, named by the field at fault. The web edge answers it 422 with
 * `fields: { [field]: message }` (lib/http/to-error-body.ts picks up any error with field + code).
 */
export class BillingInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
    readonly code = "invalid_input",
  ) {
    super(message);
  }
}
