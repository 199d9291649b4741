import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CardCautions, VerifiedCardView } from "@/components/cards/verified-card-view";
import { getDb } from "@/db/client";
import { spendRateLimitForPage } from "@/lib/auth/rate-limit";
import { HttpError } from "@/lib/http/errors";
import { verifyCardCode } from "@/lib/cards/verify";
import { verifyBuildCardCode } from "@/lib/build-record/card";
import { VerifiedBuildCardView } from "@/components/build/verified-build-card";

export const metadata: Metadata = { title: "Balance card check", robots: { index: false } };

export default async function VerifiedCardPage({ params }: { params: Promise<{ code: string }> }) {
  const { code } = await params;
  const typed = decodeURIComponent(code);
  const limited = await spendRateLimitForPage("verify");
  if (limited) {
    return (
      <p className="text-replace" data-testid="rate-limited">
        {limited}
      </p>
    );
  }
  const card = await verifyCardCode(getDb(), typed).catch(async (error: unknown) => {
    if (error instanceof HttpError && error.status === 404) return null;
    throw error;
  });
  if (!card) {
    // The same code and QR lead here from an issued engine build record.
    const built = await verifyBuildCardCode(getDb(), typed);
    if (!built) notFound();
    return <VerifiedBuildCardView card={built} />;
  }
  return (
    <>
      <h1 className="text-2xl font-semibold">Balance card {card.verificationCode}</h1>
      <VerifiedCardView card={card} />
      <p className="text-sm text-graphite-600">
        These are the figures as the shop issued them. To check that a PDF you were given is this
        very card, unchanged,{" "}
        <Link href="/verify" className="underline">
          upload it here
        </Link>
        .
      </p>
      <CardCautions />
    </>
  );
}
