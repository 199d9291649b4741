import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import { afterAll, afterEach, beforeAll, vi } from "vitest";
import { POST as webhookRoute } from "@/app/api/payments/webhook/route";
import type { DB } from "@/db/client";
import { insertPaymentSession, type PaymentSession } from "@/db/payments";
import { resetEnvCache } from "@/lib/env";
import { resetStripeClient } from "@/lib/payments/stripe";
import { type FakePayments, startFakePayments } from "@/scripts/fake-payments";
import { noParams } from "../helpers/http";

export const TEST_WEBHOOK_SECRET = "whsec_local";

/** A checkout.session.completed event as the provider sends it, paid, for an invoice. */
export function completedEvent(
  invoiceId: number,
  amountCents: number,
  overrides: {
    eventId?: string;
    sessionId?: string;
    paymentStatus?: "paid" | "unpaid";
    currency?: string;
  } = {},
) {
  return {
    id: overrides.eventId ?? `evt_test_${Math.random().toString(36).slice(2)}`,
    object: "event",
    type: "checkout.session.completed",
    created: Math.floor(Date.now() / 1000),
    livemode: false,
    data: {
      object: {
        id: overrides.sessionId ?? "cs_test_one",
        object: "checkout.session",
        amount_total: amountCents,
        currency: overrides.currency ?? "usd",
        payment_status: overrides.paymentStatus ?? "paid",
        status: "complete",
        payment_intent: "pi_test_one",
        client_reference_id: String(invoiceId),
        metadata: { invoiceId: String(invoiceId) },
      },
    },
  };
}

/**
 * A checkout session as the checkout stores it when the payment page opens: the invoice, amount
 * and currency the webhook checks a payment against.
 */
export function storeSession(
  db: DB,
  invoiceId: number,
  amount: string,
  id = "cs_test_one",
  currency = "USD",
): Promise<PaymentSession> {
  return insertPaymentSession(
    db,
    {
      id,
      invoiceId,
      amount,
      currency,
      url: `http://127.0.0.1:9/pay/${id}`,
      expiresAt: new Date(Date.now() + 24 * 3600_000).toISOString(),
    },
    null,
  );
}

/** The raw request the provider would make: body and, unless left off, its signature header. */
export function webhookRequest(
  payload: string,
  signature: { secret: string } | { header: string } | null = { secret: TEST_WEBHOOK_SECRET },
): Request {
  const headers: Record<string, string> = { "content-type": "application/json" };
  if (signature) {
    headers["stripe-signature"] =
      "header" in signature
        ? signature.header
        : Stripe.webhooks.generateTestHeaderString({ payload, secret: signature.secret });
  }
  return new Request("http://localhost/api/payments/webhook", {
    method: "POST",
    headers,
    body: payload,
  });
}

export async function deliver(payload: string, signature?: Parameters<typeof webhookRequest>[1]) {
  const res = await webhookRoute(webhookRequest(payload, signature), noParams);
  return { status: res.status, body: await res.json() };
}

/** A tiny node:http server that hands each request to the webhook route handler, as Next would. */
export async function startWebhookAdapter(): Promise<{ url: string; server: Server }> {
  const server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", async () => {
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers))
        if (typeof v === "string") headers.set(k, v);
      const request = new Request(`http://127.0.0.1${req.url}`, {
        method: req.method,
        headers,
        body: Buffer.concat(chunks).toString("utf8"),
      });
      const response = await webhookRoute(request, noParams);
      res.writeHead(response.status, { "content-type": "application/json" });
      res.end(await response.text());
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as AddressInfo;
  return { url: `http://127.0.0.1:${port}/api/payments/webhook`, server };
}

/** Our payment-provider fake for one test file, with the SDK pointed at it. */
export interface ProviderFake {
  /** The running fake (its address and the notices it delivered). */
  readonly fake: FakePayments;
  /** Points the SDK at `url` (the fake, or a closed port to play an unreachable provider). */
  pointAt(url: string): void;
  /** The session as the provider holds it (the fake answers the SDK's read). */
  atProvider(sessionId: string): Promise<{ status: string; amount_total: number }>;
  /** The customer presses Pay on the session's page. */
  pay(sessionId: string): Promise<Response>;
}

/**
 * Starts the fake provider and a webhook adapter it notifies before the file's tests, points the
 * SDK at it, and stops both after; each test ends pointed at the fake again.
 */
export function startProviderFakeForFile(): ProviderFake {
  let fake: FakePayments | undefined;
  let adapter: Server | undefined;
  const pointAt = (url: string) => {
    vi.stubEnv("STRIPE_API_BASE", url);
    resetEnvCache();
    resetStripeClient();
  };
  const running = () => {
    if (!fake) throw new Error("the payment fake starts in beforeAll");
    return fake;
  };
  beforeAll(async () => {
    const hook = await startWebhookAdapter();
    adapter = hook.server;
    fake = await startFakePayments({
      port: 0,
      webhookUrl: hook.url,
      webhookSecret: TEST_WEBHOOK_SECRET,
    });
    pointAt(fake.url);
  });
  afterEach(() => pointAt(running().url));
  afterAll(async () => {
    await fake?.stop();
    await new Promise((r) => adapter?.close(r));
    vi.unstubAllEnvs();
    resetEnvCache();
    resetStripeClient();
  });
  return {
    get fake() {
      return running();
    },
    pointAt,
    async atProvider(sessionId) {
      const res = await fetch(`${running().url}/v1/checkout/sessions/${sessionId}`, {
        headers: { authorization: "Bearer sk_test_local" },
      });
      return res.json();
    },
    pay: (sessionId) =>
      fetch(`${running().url}/pay/${sessionId}/pay`, { method: "POST", redirect: "manual" }),
  };
}
