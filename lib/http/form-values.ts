/**
 * A form's fields as plain strings, without React's own `$ACTION_…` entries and without empty
 * boxes (so optional fields read as absent rather than as "").
 */
export function formValues(form: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [key, value] of form) {
    if (typeof value === "string" && value !== "" && !key.startsWith("$")) values[key] = value;
  }
  return values;
}
