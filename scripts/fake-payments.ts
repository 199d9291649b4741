// A local stand-in for the payment provider, just big enough for what Counterpoise asks of it:
// create, read and expire a Checkout Session, show a hosted page with Pay and Decline, and send the
// signed notification to our webhook. Standalone: `npx tsx scripts/fake-payments.ts`
// (FAKE_PAYMENTS_PORT, FAKE_PAYMENTS_WEBHOOK_URL, STRIPE_WEBHOOK_SECRET from the environment).
import { randomBytes } from "node:crypto";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import { pathToFileURL } from "node:url";
import Stripe from "stripe";

export interface FakePaymentsOptions {
  /** 0 picks a free port. */
  port: number;
  /** Where signed notifications go, e.g. http://127.0.0.1:3000/api/payments/webhook. */
  webhookUrl: string;
  webhookSecret: string;
  /** The address browsers reach this server at (defaults to http://127.0.0.1:<port>). */
  publicUrl?: string;
  host?: string;
}

export interface Delivery {
  eventId: string;
  type: string;
  sessionId: string;
  /** The webhook's HTTP status, or 0 when it could not be reached. */
  status: number;
  attempts: number;
}

export interface FakePayments {
  url: string;
  stop: () => Promise<void>;
  /** Every notification sent, in order (for tests and for looking at what happened). */
  deliveries: readonly Delivery[];
}

interface FakeSession {
  id: string;
  object: "checkout.session";
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  mode: string;
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  payment_intent: string | null;
  success_url: string;
  cancel_url: string | null;
  client_reference_id: string | null;
  customer_email: string | null;
  metadata: Record<string, string>;
  line_items_summary: {
    name: string;
    description: string | null;
    amount: number;
    quantity: number;
  }[];
  url: string | null;
  created: number;
  expires_at: number;
  livemode: false;
}

type FormValue = string | { [key: string]: FormValue };

/** Reads `a[b][0][c]=x` pairs, as the SDK sends them, into nested objects. */
export function parseStripeForm(body: string): Record<string, FormValue> {
  const root: Record<string, FormValue> = {};
  for (const [key, value] of new URLSearchParams(body)) {
    const path = key.replace(/\]/g, "").split("[");
    let node: Record<string, FormValue> = root;
    path.forEach((segment, i) => {
      if (i === path.length - 1) node[segment] = value;
      else {
        const next = node[segment];
        node = typeof next === "object" ? next : (node[segment] = {});
      }
    });
  }
  return root;
}

const str = (v: FormValue | undefined): string | null => (typeof v === "string" ? v : null);
const obj = (v: FormValue | undefined): Record<string, FormValue> =>
  typeof v === "object" ? v : {};

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

function sendJson(res: ServerResponse, status: number, body: unknown) {
  res.writeHead(status, { "content-type": "application/json" });
  res.end(JSON.stringify(body));
}

function apiError(res: ServerResponse, status: number, message: string, param?: string) {
  sendJson(res, status, {
    error: { type: "invalid_request_error", message, ...(param ? { param } : {}) },
  });
}

/** The SDK sends `Bearer sk_…`; curl's `-u sk_…:` sends the same key as Basic. */
function hasSecretKey(header: string | undefined): boolean {
  if (!header) return false;
  if (/^Bearer sk_/.test(header)) return true;
  const basic = /^Basic (.+)$/.exec(header);
  return !!basic && Buffer.from(basic[1]!, "base64").toString("utf8").startsWith("sk_");
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function formatAmount(minor: number, currency: string): string {
  const major = `${Math.floor(minor / 100)}.${String(minor % 100).padStart(2, "0")}`;
  try {
    return new Intl.NumberFormat("en-US", { style: "currency", currency }).format(
      major as unknown as number,
    );
  } catch {
    return `${major} ${currency.toUpperCase()}`;
  }
}

function payPage(session: FakeSession): string {
  const items = session.line_items_summary
    .map(
      (i) =>
        `<li><strong>${escapeHtml(i.name)}</strong>${i.description ? `<br><span>${escapeHtml(i.description)}</span>` : ""}</li>`,
    )
    .join("");
  const open = session.status === "open";
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Test payment</title>
<style>
  body{margin:0;font-family:system-ui,sans-serif;background:#f5f6f7;color:#17191d}
  main{max-width:26rem;margin:4rem auto;background:#fff;border:1px solid #cdd1d6;border-radius:6px;padding:1.5rem}
  .tag{font:600 .7rem/1 ui-monospace,monospace;letter-spacing:.2em;text-transform:uppercase;color:#9a7524}
  h1{font-size:2rem;margin:.5rem 0 1rem;font-variant-numeric:tabular-nums}
  ul{padding:0;list-style:none;margin:0 0 1.5rem} li span{color:#5c6673;font-size:.9rem}
  form{display:inline} button{font:600 1rem system-ui;padding:.6rem 1.4rem;border-radius:4px;cursor:pointer;margin-right:.5rem}
  .pay{background:#262a31;color:#fff;border:0} .decline{background:#fff;border:1px solid #a9b0b8;color:#262a31}
  p.note{color:#5c6673;font-size:.85rem;margin-top:1.5rem}
</style></head>
<body><main>
  <div class="tag">Local test payment · no money moves</div>
  <h1 data-testid="fake-amount">${escapeHtml(formatAmount(session.amount_total, session.currency))}</h1>
  <ul>${items}</ul>
  ${
    open
      ? `<form method="post" action="/pay/${session.id}/pay"><button class="pay" type="submit">Pay</button></form>
  <form method="post" action="/pay/${session.id}/decline"><button class="decline" type="submit">Decline</button></form>`
      : `<p>This payment is ${escapeHtml(session.status)}.</p>`
  }
  <p class="note">Session ${escapeHtml(session.id)}</p>
</main></body></html>`;
}

/** Starts the fake; resolves once it listens. */
export async function startFakePayments(options: FakePaymentsOptions): Promise<FakePayments> {
  const sessions = new Map<string, FakeSession>();
  const deliveries: Delivery[] = [];
  const host = options.host ?? "127.0.0.1";
  let publicUrl = options.publicUrl?.replace(/\/$/, "") ?? "";

  async function notify(type: string, session: FakeSession): Promise<Delivery> {
    const event = {
      id: `evt_test_${randomBytes(12).toString("hex")}`,
      object: "event",
      api_version: Stripe.API_VERSION,
      created: Math.floor(Date.now() / 1000),
      type,
      data: { object: session },
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
    };
    const payload = JSON.stringify(event);
    const delivery: Delivery = {
      eventId: event.id,
      type,
      sessionId: session.id,
      status: 0,
      attempts: 0,
    };
    deliveries.push(delivery);
    // A few quick retries, as the real service would (over hours, not milliseconds).
    while (delivery.attempts < 3) {
      delivery.attempts += 1;
      try {
        const header = Stripe.webhooks.generateTestHeaderString({
          payload,
          secret: options.webhookSecret,
        });
        const res = await fetch(options.webhookUrl, {
          method: "POST",
          headers: { "content-type": "application/json", "stripe-signature": header },
          body: payload,
        });
        delivery.status = res.status;
        if (res.status < 500) break;
      } catch (error) {
        delivery.status = 0;
        console.warn(`fake payments: webhook unreachable (${(error as Error).message})`);
      }
      await new Promise((r) => setTimeout(r, 200 * delivery.attempts));
    }
    return delivery;
  }

  function createSession(form: Record<string, FormValue>, res: ServerResponse) {
    if (str(form.mode) !== "payment")
      return apiError(res, 400, "Only mode=payment is supported here.", "mode");
    const successUrl = str(form.success_url);
    if (!successUrl)
      return apiError(res, 400, "Missing required param: success_url.", "success_url");
    const lines = Object.values(obj(form.line_items)).map(obj);
    if (lines.length === 0)
      return apiError(res, 400, "Missing required param: line_items.", "line_items");
    let currency: string | null = null;
    let total = 0;
    const summary: FakeSession["line_items_summary"] = [];
    for (const line of lines) {
      const price = obj(line.price_data);
      const amount = Number(str(price.unit_amount));
      const quantity = Number(str(line.quantity) ?? "1");
      const lineCurrency = str(price.currency);
      if (
        !Number.isSafeInteger(amount) ||
        amount < 0 ||
        !Number.isSafeInteger(quantity) ||
        quantity < 1
      ) {
        return apiError(res, 400, "Invalid unit_amount or quantity.", "line_items");
      }
      if (!lineCurrency || (currency && currency !== lineCurrency)) {
        return apiError(res, 400, "Each line needs the same currency.", "line_items");
      }
      currency = lineCurrency;
      total += amount * quantity;
      const product = obj(price.product_data);
      summary.push({
        name: str(product.name) ?? "Payment",
        description: str(product.description),
        amount,
        quantity,
      });
    }
    const id = `cs_test_${randomBytes(12).toString("hex")}`;
    const now = Math.floor(Date.now() / 1000);
    const session: FakeSession = {
      id,
      object: "checkout.session",
      amount_subtotal: total,
      amount_total: total,
      currency: currency!,
      mode: "payment",
      status: "open",
      payment_status: "unpaid",
      payment_intent: null,
      success_url: successUrl,
      cancel_url: str(form.cancel_url),
      client_reference_id: str(form.client_reference_id),
      customer_email: str(form.customer_email),
      metadata: Object.fromEntries(
        Object.entries(obj(form.metadata)).flatMap(([k, v]) =>
          typeof v === "string" ? [[k, v]] : [],
        ),
      ),
      line_items_summary: summary,
      url: `${publicUrl}/pay/${id}`,
      created: now,
      expires_at: now + 24 * 3600,
      livemode: false,
    };
    sessions.set(id, session);
    sendJson(res, 200, session);
  }

  function redirect(res: ServerResponse, location: string) {
    res.writeHead(303, { location });
    res.end();
  }

  async function handle(req: IncomingMessage, res: ServerResponse) {
    const url = new URL(req.url ?? "/", "http://fake");
    const method = req.method ?? "GET";
    if (url.pathname.startsWith("/v1/")) {
      if (!hasSecretKey(req.headers.authorization)) {
        return apiError(res, 401, "No valid API key provided.");
      }
      if (method === "POST" && url.pathname === "/v1/checkout/sessions") {
        return createSession(parseStripeForm(await readBody(req)), res);
      }
      const expire = /^\/v1\/checkout\/sessions\/([\w-]+)\/expire$/.exec(url.pathname);
      if (method === "POST" && expire) {
        const session = sessions.get(expire[1]!);
        if (!session) return apiError(res, 404, `No such checkout.session: '${expire[1]}'`, "id");
        if (session.status !== "open") {
          return apiError(
            res,
            400,
            `Only Checkout Sessions with a status in ["open"] can be expired (this one is ${session.status}).`,
          );
        }
        session.status = "expired";
        session.url = null;
        await notify("checkout.session.expired", session);
        return sendJson(res, 200, session);
      }
      const match = /^\/v1\/checkout\/sessions\/([\w-]+)$/.exec(url.pathname);
      if (method === "GET" && match) {
        const session = sessions.get(match[1]!);
        return session
          ? sendJson(res, 200, session)
          : apiError(res, 404, `No such checkout.session: '${match[1]}'`, "id");
      }
      return apiError(res, 404, `Unrecognized request URL (${method}: ${url.pathname}).`);
    }
    const page = /^\/pay\/([\w-]+)(?:\/(pay|decline))?$/.exec(url.pathname);
    const session = page ? sessions.get(page[1]!) : undefined;
    if (!page || !session) {
      res.writeHead(404, { "content-type": "text/plain" });
      return res.end("Not found");
    }
    if (method === "GET" && !page[2]) {
      res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
      return res.end(payPage(session));
    }
    if (method === "POST" && page[2] === "pay") {
      if (session.status === "open") {
        session.status = "complete";
        session.payment_status = "paid";
        session.payment_intent = `pi_test_${randomBytes(12).toString("hex")}`;
        session.url = null;
        await notify("checkout.session.completed", session);
      }
      return redirect(res, session.success_url.replace("{CHECKOUT_SESSION_ID}", session.id));
    }
    if (method === "POST" && page[2] === "decline") {
      if (session.status === "open") {
        session.status = "expired";
        session.url = null;
        await notify("checkout.session.expired", session);
      }
      return redirect(res, session.cancel_url ?? session.success_url);
    }
    res.writeHead(405, { "content-type": "text/plain" });
    res.end("Method not allowed");
  }

  const server = createServer((req, res) => {
    handle(req, res).catch((error: unknown) => {
      console.error("fake payments:", error);
      if (!res.headersSent) apiError(res, 500, "Fake payments failed.");
      else res.end();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, host, () => resolve());
  });
  const { port } = server.address() as AddressInfo;
  const url = `http://${host}:${port}`;
  if (!publicUrl) publicUrl = url;
  return {
    url,
    deliveries,
    stop: () =>
      new Promise<void>((resolve, reject) => {
        server.closeAllConnections();
        server.close((error) => (error ? reject(error) : resolve()));
      }),
  };
}

const runAsScript =
  process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;

if (runAsScript) {
  const { env } = await import("@/lib/env");
  const { DEMO_WEBHOOK_SECRET } = await import("@/lib/payments/stripe");
  const e = env();
  const fake = await startFakePayments({
    port: e.FAKE_PAYMENTS_PORT,
    webhookUrl: e.FAKE_PAYMENTS_WEBHOOK_URL ?? "http://127.0.0.1:3000/api/payments/webhook",
    webhookSecret: e.STRIPE_WEBHOOK_SECRET ?? DEMO_WEBHOOK_SECRET,
  });
  console.log(`fake payments listening on ${fake.url} (set STRIPE_API_BASE=${fake.url})`);
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.on(signal, () => void fake.stop().then(() => process.exit(0)));
  }
}
