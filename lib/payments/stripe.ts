import Stripe from "stripe";
import { env } from "@/lib/env";

/** Demo keys, used only outside production; the local fake accepts them. */
export const DEMO_SECRET_KEY = "sk_test_local";
export const DEMO_WEBHOOK_SECRET = "whsec_local";

export interface PaymentConfig {
  secretKey: string;
  webhookSecret: string;
  /** Where the SDK sends requests; null for the real service. */
  apiBase: URL | null;
}

/** The payment settings from the environment; production must set real keys. */
export function paymentConfig(): PaymentConfig {
  const e = env();
  const production = e.NODE_ENV === "production";
  const secretKey = e.STRIPE_SECRET_KEY ?? (production ? undefined : DEMO_SECRET_KEY);
  const webhookSecret = e.STRIPE_WEBHOOK_SECRET ?? (production ? undefined : DEMO_WEBHOOK_SECRET);
  if (!secretKey || !webhookSecret) {
    throw new Error("STRIPE_SECRET_KEY and STRIPE_WEBHOOK_SECRET must be set in production.");
  }
  return {
    secretKey,
    webhookSecret,
    apiBase: e.STRIPE_API_BASE ? new URL(e.STRIPE_API_BASE) : null,
  };
}

const holder = globalThis as unknown as { counterpoiseStripe?: Stripe };

/**
 * The SDK client, made on first use. With STRIPE_API_BASE set it talks to that address (our
 * local fake) over the same calls it would make to the real service.
 */
export function stripeClient(): Stripe {
  if (holder.counterpoiseStripe) return holder.counterpoiseStripe;
  const { secretKey, apiBase } = paymentConfig();
  holder.counterpoiseStripe = new Stripe(secretKey, {
    maxNetworkRetries: 1,
    timeout: 20_000,
    ...(apiBase
      ? {
          host: apiBase.hostname,
          port: apiBase.port || (apiBase.protocol === "https:" ? 443 : 80),
          protocol: apiBase.protocol === "https:" ? "https" : "http",
          telemetry: false,
        }
      : {}),
  });
  return holder.counterpoiseStripe;
}

/** For tests that point the client somewhere else between cases. */
export function resetStripeClient(): void {
  holder.counterpoiseStripe = undefined;
}
