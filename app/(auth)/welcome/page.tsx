import Link from "next/link";
import { WelcomeForm } from "@/components/mail/welcome-form";
import { Providers } from "@/components/providers";
import { getDb } from "@/db/client";
import { findInviteState, type InviteState } from "@/lib/mail/invites";
import { inviteTokenField } from "@/lib/validation/invites";

export const metadata = { title: "Set your password", robots: { index: false } };

// Every visit checks the link against the database.
export const dynamic = "force-dynamic";

const CLOSED: Record<Exclude<InviteState["state"], "open">, { title: string; text: string }> = {
  unknown: {
    title: "This link is not valid",
    text: "Check that the whole link from the e-mail was opened, or ask the shop to send a new invite.",
  },
  used: {
    title: "This link has already been used",
    text: "Your password is set. Sign in with your e-mail and that password.",
  },
  expired: {
    title: "This link has expired",
    text: "Invite links work for a limited time. Ask the shop to send you a new one.",
  },
  replaced: {
    title: "A newer invite was sent",
    text: "Only the link in the most recent invite e-mail works. Look for it in your inbox.",
  },
};

export default async function WelcomePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { token } = await searchParams;
  const parsed = inviteTokenField.safeParse(typeof token === "string" ? token : "");
  const valid = parsed.success ? parsed.data : "";
  const state: InviteState = valid ? await findInviteState(getDb(), valid) : { state: "unknown" };

  return (
    <main className="flex min-h-screen items-center justify-center bg-graphite-800 p-4">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center text-white">
          <p className="font-mono text-sm tracking-[0.3em] text-brass-300 uppercase">
            Counterpoise
          </p>
          <h1 className="mt-1 text-2xl font-semibold">
            {state.state === "open" ? "Set your password" : CLOSED[state.state].title}
          </h1>
        </div>
        <div className="panel p-6 shadow-lg" data-testid={`welcome-${state.state}`}>
          {state.state === "open" ? (
            <Providers>
              <WelcomeForm token={valid} email={state.email} />
            </Providers>
          ) : (
            <div className="space-y-4 text-sm">
              <p>{CLOSED[state.state].text}</p>
              <Link href="/sign-in" className="btn-secondary w-full">
                Go to sign-in
              </Link>
            </div>
          )}
        </div>
      </div>
    </main>
  );
}
