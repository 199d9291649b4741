import Link from "next/link";
import type { ReactNode } from "react";

// Public pages: whoever holds a balance card may check it here without signing in.
export const dynamic = "force-dynamic";

export default function VerifyLayout({ children }: { children: ReactNode }) {
  return (
    <>
      <header className="border-b border-graphite-200 bg-white">
        <div className="mx-auto flex max-w-3xl items-baseline justify-between px-4 py-3">
          <Link href="/verify" className="font-semibold">
            Counterpoise <span className="font-normal text-graphite-500">· balance card check</span>
          </Link>
        </div>
      </header>
      <main className="mx-auto max-w-3xl space-y-6 px-4 py-8">{children}</main>
    </>
  );
}
