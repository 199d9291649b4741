"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => signOut({ callbackUrl: "/sign-in" })}
      className="rounded px-3 py-1.5 text-sm text-graphite-200 hover:bg-graphite-700 hover:text-white"
    >
      Sign out
    </button>
  );
}
