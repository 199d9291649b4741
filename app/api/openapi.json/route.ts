import { json } from "@/lib/http/route";
import { buildOpenApiDocument } from "@/lib/openapi/document";

let cached: unknown;

/** The API description, generated from the zod schemas the handlers parse with. */
export function GET() {
  cached ??= buildOpenApiDocument();
  return json(cached);
}
