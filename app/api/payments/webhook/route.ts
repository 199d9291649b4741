import { getDb } from "@/db/client";
import { json, route } from "@/lib/http/route";
import { paymentConfig } from "@/lib/payments/stripe";
import { handlePaymentWebhook } from "@/lib/payments/webhook";

// The provider's signed notifications. No session: the signature over the raw body is the check.
export const POST = route(async (req) => {
  const payload = await req.text();
  const { status, body } = await handlePaymentWebhook(
    getDb(),
    payload,
    req.headers.get("stripe-signature"),
    paymentConfig().webhookSecret,
  );
  return json(body, status);
});
