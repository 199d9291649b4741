import { SignInForm } from "@/components/auth/sign-in-form";
import { safeNextPath } from "@/lib/auth/safe-next";
import { SIGN_IN_FAILED } from "@/lib/auth/messages";

export const metadata = { title: "Sign in" };

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const { next, expired, error } = await searchParams;
  const safeNext = safeNextPath(next);
  return (
    <main className="flex min-h-screen items-center justify-center bg-graphite-800 p-4">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center text-white">
          <p className="font-mono text-sm tracking-[0.3em] text-brass-300 uppercase">
            Counterpoise
          </p>
          <h1 className="mt-1 text-2xl font-semibold">Shop sign-in</h1>
        </div>
        <div className="panel p-6 shadow-lg">
          {expired ? (
            <p
              className="mb-4 rounded bg-brass-50 p-3 text-sm text-brass-700"
              data-testid="session-expired"
            >
              Your session ended. Sign in again to carry on where you were.
            </p>
          ) : null}
          <SignInForm next={safeNext} initialError={error ? SIGN_IN_FAILED : undefined} />
        </div>
      </div>
    </main>
  );
}
