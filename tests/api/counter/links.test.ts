import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { POST as checkoutRoute } from "@/app/api/invoices/[id]/checkout/route";
import PayReturnPage from "@/app/pay/return/page";
import type { DB } from "@/db/client";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { cardVerifyUrl } from "@/lib/cards/urls";
import { appBaseUrl, appBaseUrlWarning, resetEnvCache } from "@/lib/env";
import { appBaseUrl as mailBaseUrl } from "@/lib/mail/invites";
import { resetStripeClient } from "@/lib/payments/stripe";
import { type FakePayments, startFakePayments } from "@/scripts/fake-payments";
import { type BillingWorld, setUpBilling } from "../billing/fixtures";
import { freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

// Every link a customer follows from outside a page (QR code, e-mail, payment page) must lead to
// the address the shop configured, never to the machine the server runs on.
const PUBLIC = "https://balance.shop.example.test";

let fake: FakePayments;
let db: DB;
let w: BillingWorld;

beforeAll(async () => {
  fake = await startFakePayments({
    port: 0,
    webhookUrl: "http://127.0.0.1:9/none",
    webhookSecret: "whsec_local",
  });
  vi.stubEnv("STRIPE_API_BASE", fake.url);
  vi.stubEnv("APP_URL", `${PUBLIC}/`);
  vi.stubEnv("NEXTAUTH_URL", "http://localhost:3000");
  resetEnvCache();
  resetStripeClient();
});

afterAll(async () => {
  await fake.stop();
  vi.unstubAllEnvs();
  resetEnvCache();
  resetStripeClient();
});

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  vi.spyOn(console, "info").mockImplementation(() => {});
});

afterEach(() => vi.mocked(console.info).mockRestore());

describe("one public address for every link", () => {
  it("cards, e-mails and the app share APP_URL, without its trailing slash", () => {
    expect(appBaseUrl()).toBe(PUBLIC);
    expect(mailBaseUrl()).toBe(PUBLIC);
    expect(cardVerifyUrl("ABCD-2345")).toBe(`${PUBLIC}/verify/ABCD-2345`);
  });

  it("the payment page sends the customer back to APP_URL, not to the request's host", async () => {
    const draft = await createInvoice(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
      null,
    );
    const invoice = await issueInvoice(db, draft.id, null);
    signInAs(w.users.customer);
    const res = await checkoutRoute(
      jsonRequest("POST", `/api/invoices/${invoice.id}/checkout`),
      params({ id: String(invoice.id) }),
    );
    expect(res.status).toBe(201);
    const { sessionId } = await res.json();
    const paid = await fetch(`${fake.url}/pay/${sessionId}/pay`, {
      method: "POST",
      redirect: "manual",
    });
    expect(paid.headers.get("location")).toBe(
      `${PUBLIC}/pay/return?invoice=${invoice.id}&result=success&session_id=${sessionId}`,
    );
  });

  it("a signed-out customer back from paying is sent to sign-in, and from there to the same result", async () => {
    signInAs(null);
    const error = await PayReturnPage({
      searchParams: Promise.resolve({ invoice: "12", result: "success", session_id: "cs_x" }),
    }).catch((e: unknown) => e);
    const digest = String((error as { digest?: string }).digest);
    expect(digest).toContain("NEXT_REDIRECT");
    const location = digest.split(";")[2] ?? "";
    const next = new URL(location, PUBLIC).searchParams.get("next");
    expect(next).toBe("/pay/return?invoice=12&result=success&session_id=cs_x");
  });

  it("warns at start in production when links would point at this machine only", () => {
    const base = { NODE_ENV: "production", NEXTAUTH_SECRET: "x".repeat(40) } as const;
    expect(appBaseUrlWarning({ ...base, NEXTAUTH_URL: "http://localhost:3000" })).toContain(
      "APP_URL",
    );
    expect(appBaseUrlWarning({ ...base, APP_URL: "http://127.0.0.1:3100" })).toContain("APP_URL");
    expect(appBaseUrlWarning({ ...base, APP_URL: PUBLIC })).toBeNull();
    expect(appBaseUrlWarning({ NODE_ENV: "development" })).toBeNull();
  });
});
