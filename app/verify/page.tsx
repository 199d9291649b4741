import type { Metadata } from "next";
import Link from "next/link";
import { CardCheckForm } from "@/components/cards/card-check-form";
import { Providers } from "@/components/providers";
import { CardCautions, VerifiedCardView } from "@/components/cards/verified-card-view";
import { getDb } from "@/db/client";
import { spendRateLimitForPage } from "@/lib/auth/rate-limit";
import { type VerifiedCard, verifyCardCode } from "@/lib/cards/verify";
import { HttpError } from "@/lib/http/errors";

export const metadata: Metadata = { title: "Check a balance card", robots: { index: false } };

async function lookUp(typed: string): Promise<VerifiedCard | null> {
  try {
    return await verifyCardCode(getDb(), typed);
  } catch (error) {
    if (error instanceof HttpError && error.status === 404) return null;
    throw error;
  }
}

export default async function VerifyPage({
  searchParams,
}: {
  searchParams: Promise<{ code?: string | string[] }>;
}) {
  const { code } = await searchParams;
  const typed = typeof code === "string" ? code.trim().slice(0, 40) : "";
  // Each code looked up counts against the address's limit (lib/auth/rate-limit.ts).
  const limited = typed ? await spendRateLimitForPage("verify") : null;
  const card = typed && !limited ? await lookUp(typed) : null;
  return (
    <>
      <h1 className="text-2xl font-semibold">Check a balance card</h1>
      <p className="text-graphite-700">
        Every balance card carries a verification code beside its QR code. Type it in to see the
        card&apos;s figures as the shop issued them, or upload the PDF to check that it is the very
        file the shop issued, unchanged.
      </p>
      <form action="/verify" method="get" className="panel flex flex-wrap items-end gap-3 p-4">
        <div className="grow">
          <label htmlFor="verify-code" className="mb-1 block text-sm font-semibold">
            Verification code
          </label>
          <input
            id="verify-code"
            name="code"
            required
            autoComplete="off"
            spellCheck={false}
            placeholder="7KQ2M-9XW4D"
            defaultValue={typed}
            className="field-input font-mono uppercase"
          />
        </div>
        <button type="submit" className="btn-primary">
          Look up
        </button>
      </form>
      {typed ? (
        <div aria-live="polite" data-testid="code-result">
          {limited ? (
            <p className="text-replace" data-testid="rate-limited">
              {limited}
            </p>
          ) : card ? (
            <>
              <VerifiedCardView card={card} />
              <p className="mt-2 text-sm">
                <Link
                  href={`/verify/${card.verificationCode.replace("-", "")}`}
                  className="underline"
                >
                  Link to this card&apos;s page
                </Link>
              </p>
            </>
          ) : (
            <p className="text-replace">
              No balance card has this verification code. Check the code printed beside the QR code
              (ten letters and digits, such as 7KQ2M-9XW4D) or ask the shop that issued it.
            </p>
          )}
        </div>
      ) : null}
      <Providers>
        <CardCheckForm />
      </Providers>
      <CardCautions />
    </>
  );
}
