import { decode, encode } from "next-auth/jwt";
import { cookies } from "next/headers";
import { authSecret } from "@/lib/env";
import { SESSION_MAX_AGE_SECONDS } from "./options";

const SESSION_COOKIES = ["__Secure-next-auth.session-token", "next-auth.session-token"];

/**
 * Keeps the current session after a password change: its cookie is written again with the new
 * session version (same session id, a fresh working day), while every other cookie of the user
 * still carries the old version and ends. For a route handler or a server action.
 * Answers false when the request had no readable session cookie (the person signs in again).
 */
export async function reissueSessionCookie(sessionVersion: number): Promise<boolean> {
  const store = await cookies();
  const cookie = store.getAll().find((c) => SESSION_COOKIES.includes(c.name));
  if (!cookie) return false;
  const secret = authSecret();
  const token = await decode({ token: cookie.value, secret });
  if (!token) return false;
  const value = await encode({
    token: { ...token, sv: sessionVersion },
    secret,
    maxAge: SESSION_MAX_AGE_SECONDS,
  });
  store.set(cookie.name, value, {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: cookie.name.startsWith("__Secure-"),
    maxAge: SESSION_MAX_AGE_SECONDS,
  });
  return true;
}
