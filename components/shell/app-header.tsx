import Link from "next/link";
import type { User } from "@/db/users";
import { navFor } from "./nav";
import { SignOutButton } from "./sign-out-button";

const ROLE_LABEL = {
  owner: "Owner",
  machinist: "Machinist",
  counter: "Counter",
  customer: "Customer",
} as const;

export function AppHeader({ user }: { user: User }) {
  return (
    <header className="bg-graphite-800 text-white">
      <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
        <Link href="/jobs" className="font-mono text-sm tracking-[0.25em] text-brass-300 uppercase">
          Counterpoise
        </Link>
        <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
          {navFor(user.role).map((item) => (
            <Link
              key={item.href}
              href={item.href}
              className="rounded px-3 py-1.5 text-sm font-semibold hover:bg-graphite-700"
            >
              {item.label}
            </Link>
          ))}
        </nav>
        <div className="flex items-center gap-3 text-sm">
          <span className="text-graphite-200">
            {user.name} · <span className="text-brass-300">{ROLE_LABEL[user.role]}</span>
          </span>
          <Link href="/account/password" className="text-graphite-200 underline hover:text-white">
            Password
          </Link>
          <SignOutButton />
        </div>
      </div>
    </header>
  );
}
