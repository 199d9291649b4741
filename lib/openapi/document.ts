import { z } from "zod";
import {
  createDocument,
  type ZodOpenApiOperationObject,
  type ZodOpenApiPathsObject,
} from "zod-openapi";
import {
  balanceRequestSchema,
  crankRequestSchema,
  holeRequestSchema,
} from "@/lib/validation/balance";
import { customerSchema, listQuerySchema } from "@/lib/validation/customers";
import { jobChangesSchema, jobListQuerySchema } from "@/lib/validation/jobs";
import { newUserSchema, userChangesSchema } from "@/lib/validation/users";
import {
  bookingSchema,
  pairingApplySchema,
  rotatingWriteSchema,
  targetWriteSchema,
  weightWriteSchema,
} from "@/lib/validation/workshop";

const errorBody = z
  .object({
    error: z.object({
      code: z.string(),
      message: z.string(),
      fields: z.record(z.string(), z.string()).optional(),
    }),
  })
  .meta({ id: "Error" });

const errors = {
  "401": { description: "Not signed in", content: { "application/json": { schema: errorBody } } },
  "403": {
    description: "This role may not do this",
    content: { "application/json": { schema: errorBody } },
  },
  "404": {
    description: "No such record (or not yours)",
    content: { "application/json": { schema: errorBody } },
  },
  "409": {
    description: "Stale or conflicting write",
    content: { "application/json": { schema: errorBody } },
  },
  "422": {
    description: "Invalid input, one message per field",
    content: { "application/json": { schema: errorBody } },
  },
};

const ok = (description: string) => ({ "200": { description }, ...errors });
const idParam = z.object({ id: z.string().meta({ description: "Numeric id" }) });

function op(
  summary: string,
  body?: z.ZodType,
  query?: z.ZodObject,
  path: z.ZodObject = idParam,
): ZodOpenApiOperationObject {
  return {
    summary,
    ...(body ? { requestBody: { content: { "application/json": { schema: body } } } } : {}),
    requestParams: {
      ...(query ? { query } : {}),
      ...(path.shape && Object.keys(path.shape).length ? { path } : {}),
    },
    responses: ok(summary),
  };
}

const none = z.object({});

/** Every JSON route the pages use, described from the same zod schemas the handlers parse with. */
export const API_PATHS: ZodOpenApiPathsObject = {
  "/api/health": {
    get: {
      summary: "Database reachable and at the latest migration",
      responses: {
        "200": { description: "ok" },
        "503": { description: "down or needs migration" },
      },
    },
  },
  "/api/balance": {
    post: op(
      "Match a set, plan the removal and work out bobweights",
      balanceRequestSchema,
      undefined,
      none,
    ),
  },
  "/api/balance/crank": {
    post: op(
      "Permissible residual per plane (ISO 21940-11), optionally checking readings",
      crankRequestSchema,
      undefined,
      none,
    ),
  },
  "/api/balance/hole": {
    post: op(
      "Drill depth, heavy-metal plug, moved or split correction",
      holeRequestSchema,
      undefined,
      none,
    ),
  },
  "/api/users": {
    get: op("List users (owner)", undefined, undefined, none),
    post: op("Add a user (owner)", newUserSchema, undefined, none),
  },
  "/api/users/{id}": {
    get: op("One user (owner)"),
    patch: op("Change role, name or disabled (owner)", userChangesSchema),
  },
  "/api/customers": {
    get: op("Search customers", undefined, listQuerySchema, none),
    post: op("Add a customer", customerSchema, undefined, none),
  },
  "/api/customers/{id}": {
    get: op("One customer"),
    patch: op("Change a customer", customerSchema),
  },
  "/api/jobs": {
    get: op(
      "Search, filter, sort and page jobs (a customer sees only theirs)",
      undefined,
      jobListQuerySchema,
      none,
    ),
    post: op("Book a job in", bookingSchema, undefined, none),
  },
  "/api/jobs/{id}": {
    get: op("One job"),
    patch: op("Change a job's state, notes or settings (with the version read)", jobChangesSchema),
  },
  "/api/jobs/{id}/workshop": {
    get: op("Weights, targets, rotating-part records and the worked-out plan"),
  },
  "/api/jobs/{id}/weights": {
    put: op(
      "Save one part's readings (with the version read; 0 for a new part)",
      weightWriteSchema,
    ),
  },
  "/api/jobs/{id}/targets": {
    put: op("Set or clear the target for one kind of part", targetWriteSchema),
  },
  "/api/jobs/{id}/pairing": {
    post: op("Move piston assemblies onto other rods", pairingApplySchema),
  },
  "/api/jobs/{id}/rotating/{part}": {
    put: op(
      "Record the crank, flywheel, clutch or damper on the balancer",
      rotatingWriteSchema,
      undefined,
      z.object({ id: z.string(), part: z.enum(["crankshaft", "flywheel", "clutch", "damper"]) }),
    ),
  },
};

export function buildOpenApiDocument(extraPaths: ZodOpenApiPathsObject = {}) {
  return createDocument({
    openapi: "3.1.0",
    info: {
      title: "Counterpoise API",
      version: "1",
      description:
        "Every page action is one of these calls. Masses and lengths are decimal strings.",
    },
    components: {
      securitySchemes: {
        session: { type: "apiKey", in: "cookie", name: "next-auth.session-token" },
      },
    },
    security: [{ session: [] }],
    paths: { ...API_PATHS, ...extraPaths },
  });
}
