import type { NextAuthOptions } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { endSession } from "@/db/sessions";
import { findSessionVersion } from "@/db/users";
import { authSecret } from "@/lib/env";
import { signInSchema } from "@/lib/validation/users";
import { signInWithPassword } from "./sign-in";
import { clientAddress } from "./throttle";

/** Sessions last a working day; after that the sign-in page says the session expired. */
export const SESSION_MAX_AGE_SECONDS = 12 * 60 * 60;

export function authOptions(): NextAuthOptions {
  return {
    secret: authSecret(),
    session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_SECONDS },
    pages: { signIn: "/sign-in", error: "/sign-in" },
    providers: [
      Credentials({
        name: "E-mail and password",
        credentials: { email: { type: "email" }, password: { type: "password" } },
        async authorize(credentials, req) {
          const parsed = signInSchema.safeParse(credentials);
          if (!parsed.success) throw new Error("Enter your e-mail and password.");
          const result = await signInWithPassword(
            getDb(),
            parsed.data.email,
            parsed.data.password,
            new Date(),
            clientAddress(req?.headers),
          );
          if (!result.ok) throw new Error(result.message);
          return {
            id: String(result.user.id),
            email: result.user.email,
            name: result.user.name,
            role: result.user.role,
          };
        },
      }),
    ],
    callbacks: {
      // At sign-in the cookie gets the session's own id and the user's session version
      // (lib/auth/guard.ts refuses it once either has ended).
      async jwt({ token, user }) {
        if (user) {
          token.uid = Number(user.id);
          token.role = user.role;
          token.sid = randomUUID();
          token.sv = (await findSessionVersion(getDb(), token.uid)) ?? 0;
        }
        return token;
      },
      session({ session, token }) {
        session.user = {
          ...session.user,
          id: token.uid,
          role: token.role,
          sid: token.sid,
          sv: token.sv,
        };
        return session;
      },
    },
    events: {
      // Signing out ends this session only (its id is kept until the cookie would have
      // expired), so a copy of the cookie stops working too; other devices stay signed in.
      async signOut({ token }) {
        if (!token || typeof token.sid !== "string" || typeof token.uid !== "number") return;
        const exp = typeof token.exp === "number" ? token.exp * 1000 : NaN;
        const expiresAt = Number.isFinite(exp)
          ? new Date(exp)
          : new Date(Date.now() + SESSION_MAX_AGE_SECONDS * 1000);
        await endSession(getDb(), { sid: token.sid, userId: token.uid, expiresAt });
      },
    },
  };
}
