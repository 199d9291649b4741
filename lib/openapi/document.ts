import { changePasswordSchema } from "@/lib/auth/password-schema";
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
import { mergeCustomerSchema } from "@/lib/customers/merge-schema";
import { jobChangesSchema, jobHistoryQuerySchema, jobListQuerySchema } from "@/lib/validation/jobs";
import { newUserSchema, userChangesSchema } from "@/lib/validation/users";
import {
  documentLinesSchema,
  invoiceListQuerySchema,
  jobIdQuerySchema,
  manualPaymentSchema,
  newInvoiceSchema,
  newQuoteSchema,
  priceItemChangesSchema,
  priceItemSchema,
  settingsSchema,
} from "@/lib/validation/billing";
import { issueCardSchema, sendCardSchema } from "@/lib/validation/cards";
import { acceptInviteSchema, newInviteSchema } from "@/lib/validation/invites";
import { buildRequestNewSchema, buildRequestStateSchema } from "@/lib/build-record/request-schemas";
import { BUILD_SECTIONS, sectionWriteSchema } from "@/lib/build-record/schemas";
import { buildSettingsWriteSchema } from "@/lib/build-record/settings-schema";
import { counterSettingsSchema } from "@/lib/validation/counter-settings";
import {
  applyUnappliedSchema,
  refundUnappliedSchema,
  unappliedListQuerySchema,
} from "@/lib/payments/schemas";
import {
  bookingSchema,
  pairingApplySchema,
  pairingUndoSchema,
  rotatingWriteSchema,
  targetWriteSchema,
  weightWriteSchema,
  weightsImportSchema,
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
const multipart = (summary: string, path: z.ZodObject = none): ZodOpenApiOperationObject => ({
  ...op(summary, undefined, undefined, path),
  requestBody: {
    content: {
      "multipart/form-data": { schema: z.object({ file: z.string().meta({ format: "binary" }) }) },
    },
  },
});
const file = (
  summary: string,
  type: string,
  path: z.ZodObject = idParam,
): ZodOpenApiOperationObject => ({
  ...op(summary, undefined, undefined, path),
  responses: {
    "200": {
      description: summary,
      content: { [type]: { schema: z.string().meta({ format: "binary" }) } },
    },
    ...errors,
  },
});
const cardParams = z.object({ id: z.string(), revision: z.string() });

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
  "/api/account/password": {
    post: op(
      "Change your own password (your other sessions end, this one carries on)",
      changePasswordSchema,
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
  "/api/customers/{id}/merge": {
    post: op(
      "Merge another customer into this one: jobs, quotes, invoices, accounts and invites move here; the other is removed (counter, owner)",
      mergeCustomerSchema,
    ),
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
  "/api/jobs/{id}/history": {
    get: op(
      "The job's changes, newest first, 100 at a time (the next page from `earlier`)",
      undefined,
      jobHistoryQuerySchema,
    ),
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
  "/api/jobs/{id}/pairing/undo": {
    post: op("Undo the last pairing applied (one step back)", pairingUndoSchema),
  },
  "/api/jobs/{id}/weights/import": {
    post: op(
      "Preview a CSV of weights, or write its clean rows when confirmed",
      weightsImportSchema,
    ),
  },
  "/api/jobs/{id}/weights/csv": { get: file("The weigh-in as CSV", "text/csv") },
  "/api/jobs/{id}/plan/csv": { get: file("The removal plan as CSV", "text/csv") },
  "/api/jobs/{id}/uploads": {
    get: op("Photos and printouts of a job"),
    post: multipart("Attach a photo or printout (images, PDF)", idParam),
  },
  "/api/uploads/{id}": {
    get: file("An uploaded file", "application/octet-stream"),
    delete: op("Remove an upload"),
  },
  "/api/uploads/{id}/thumbnail": { get: file("An image's thumbnail", "image/webp") },
  "/api/jobs/{id}/cards": {
    get: op("The job's balance cards, every revision"),
    post: op("Issue a balance card (a new revision)", issueCardSchema),
  },
  "/api/jobs/{id}/cards/status": {
    get: op("Whether the current balance card still matches the job, and what changed"),
  },
  "/api/jobs/{id}/cards/{revision}/pdf": {
    get: file("A balance card as issued", "application/pdf", cardParams),
  },
  "/api/jobs/{id}/cards/{revision}/send": {
    post: op("E-mail a balance card to the customer", sendCardSchema, undefined, cardParams),
  },
  "/api/verify/{code}": {
    get: op(
      "Check a card by its verification code (public)",
      undefined,
      undefined,
      z.object({ code: z.string() }),
    ),
  },
  "/api/verify/check": { post: multipart("Check a PDF against the stored cards (public)") },
  "/api/settings": {
    get: op("Shop settings", undefined, undefined, none),
    put: op("Change shop settings (owner)", settingsSchema, undefined, none),
  },
  "/api/settings/logo": {
    get: file("The shop's logo", "image/png", none),
    put: multipart("Upload the shop's logo (owner)"),
    delete: op("Remove the logo (owner)", undefined, undefined, none),
  },
  "/api/prices": {
    get: op("The price list", undefined, undefined, none),
    post: op("Add a price (owner)", priceItemSchema, undefined, none),
  },
  "/api/prices/{id}": {
    get: op("One price"),
    patch: op("Change a price (owner)", priceItemChangesSchema),
  },
  "/api/quotes": {
    get: op("Quotes of a job", undefined, jobIdQuerySchema, none),
    post: op("Make a quote from the price list", newQuoteSchema, undefined, none),
  },
  "/api/quotes/{id}": {
    get: op("One quote"),
    put: op("Change a draft quote's lines", documentLinesSchema),
  },
  "/api/quotes/{id}/offer": { post: op("Offer the quote to the customer") },
  "/api/quotes/{id}/withdraw": { post: op("Withdraw a quote") },
  "/api/quotes/{id}/accept": { post: op("Accept a quote (the customer, or the counter for them)") },
  "/api/invoices": {
    get: op("Invoices (a customer sees only theirs)", undefined, invoiceListQuerySchema, none),
    post: op("Make a draft invoice", newInvoiceSchema, undefined, none),
  },
  "/api/invoices/{id}": {
    get: op("One invoice"),
    put: op("Change a draft invoice's lines", documentLinesSchema),
    delete: op("Throw away a draft invoice"),
  },
  "/api/invoices/{id}/issue": { post: op("Issue an invoice (numbered now)") },
  "/api/invoices/{id}/void": { post: op("Void an unpaid invoice") },
  "/api/invoices/{id}/payments": {
    get: op("Payments on an invoice"),
    post: op("Record a payment by hand", manualPaymentSchema),
  },
  "/api/invoices/{id}/pdf": { get: file("The invoice as PDF", "application/pdf") },
  "/api/jobs/{id}/billing": {
    get: op(
      "The job's quotes and invoices as you may see them, each with what you may do to it, and the prices for new lines",
    ),
  },
  "/api/invoices/{id}/checkout": {
    post: op("Start paying online: answers the hosted payment page's address"),
  },
  "/api/payments/unapplied": {
    get: op(
      "Online payments received and not applied, to refund or apply (the desk)",
      undefined,
      unappliedListQuerySchema,
      none,
    ),
  },
  "/api/payments/unapplied/{id}/apply": {
    post: op(
      "Apply a payment kept to reconcile to its invoice, where it fits",
      applyUnappliedSchema,
    ),
  },
  "/api/payments/unapplied/{id}/refund": {
    post: op("Mark a payment kept to reconcile as refunded, with a note", refundUnappliedSchema),
  },
  "/api/payments/webhook": {
    post: {
      summary: "Signed notification from the payment service",
      responses: { "200": { description: "received" }, "400": { description: "bad signature" } },
    },
  },
  "/api/mail/outbox": {
    get: op("The mail log with each message (owner)", undefined, undefined, none),
  },
  "/api/mail/{id}/retry": { post: op("Send a failed message again (owner)") },
  "/api/invites": { post: op("Invite a customer to sign in", newInviteSchema, undefined, none) },
  "/api/invites/accept": {
    post: op("Set a password from an invite link (public)", acceptInviteSchema, undefined, none),
  },
  "/api/openapi.json": {
    get: { summary: "This description", responses: { "200": { description: "OpenAPI 3.1" } } },
  },
  "/api/jobs/{id}/rotating/{part}": {
    put: op(
      "Record the crank, flywheel, clutch or damper on the balancer",
      rotatingWriteSchema,
      undefined,
      z.object({ id: z.string(), part: z.enum(["crankshaft", "flywheel", "clutch", "damper"]) }),
    ),
  },
  "/api/jobs/{id}/build/requests": {
    get: op("The customer's requests for the build, each open, done or explained"),
    post: op(
      "Write down a request for the build (stays open until done or explained)",
      buildRequestNewSchema,
    ),
  },
  "/api/jobs/{id}/build/requests/{requestId}": {
    patch: op(
      "Tick a request done, explain why not, or open it again (with the version read)",
      buildRequestStateSchema,
      undefined,
      z.object({ id: z.string(), requestId: z.string() }),
    ),
  },
  "/api/jobs/{id}/build": {
    get: op("The job's build record, the shop's build settings and what the record works out to"),
  },
  "/api/jobs/{id}/build/{section}": {
    put: op(
      "Save one section of the build record (with the version read; 0 when never saved)",
      z.union(BUILD_SECTIONS.map((s) => sectionWriteSchema(s))),
      undefined,
      z.object({ id: z.string(), section: z.enum(BUILD_SECTIONS) }),
    ),
  },
  "/api/jobs/{id}/build/cards": {
    get: op("The job's issued build records, newest first"),
    post: op("Issue the next revision of the build record PDF"),
  },
  "/api/jobs/{id}/build/cards/{revision}/pdf": {
    get: file("An issued build record, exactly as issued", "application/pdf", cardParams),
  },
  "/api/jobs/{id}/build/cards/{revision}/send": {
    post: op(
      "E-mail an issued build record to the customer",
      sendCardSchema,
      undefined,
      cardParams,
    ),
  },
  "/api/settings/build": {
    get: op("The shop's build settings", undefined, undefined, none),
    put: op("Save the shop's build settings (owner)", buildSettingsWriteSchema, undefined, none),
  },
  "/api/settings/counter": {
    get: op("How the shop's e-mails go out and its time zone", undefined, undefined, none),
    put: op(
      "Save the shop's e-mail settings and time zone (owner; with the version read)",
      counterSettingsSchema,
      undefined,
      none,
    ),
  },
};

const STATE_CHANGING = ["post", "put", "patch", "delete"] as const;

/**
 * What the request guard in front of every state-changing route (lib/http/route.ts) answers
 * before the handler runs, in the one error shape: another site (403 `cross_site`), a body over
 * the route's limit (413 `too_large`), a body of a media type the route does not take (415
 * `unsupported_media_type`).
 */
const edgeRefusals = {
  "403": {
    description:
      "This role may not do this (`forbidden`), or the request came from another site (`cross_site`)",
    content: { "application/json": { schema: errorBody } },
  },
  "413": {
    description: "The body is larger than this route takes (`too_large`)",
    content: { "application/json": { schema: errorBody } },
  },
  "415": {
    description: "The body is not of the media type this route takes (`unsupported_media_type`)",
    content: { "application/json": { schema: errorBody } },
  },
};

/** Every state-changing operation lists the request guard's refusals beside its own answers. */
function withEdgeRefusals(paths: ZodOpenApiPathsObject): ZodOpenApiPathsObject {
  return Object.fromEntries(
    Object.entries(paths).map(([url, item]) => {
      const copy = { ...item };
      for (const method of STATE_CHANGING) {
        const operation = copy[method];
        if (operation) {
          copy[method] = {
            ...operation,
            responses: { ...operation.responses, ...edgeRefusals },
          };
        }
      }
      return [url, copy];
    }),
  );
}

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
    paths: withEdgeRefusals({ ...API_PATHS, ...extraPaths }),
  });
}
