import type { NextAuthOptions } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { getDb } from "@/db/client";
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
      jwt({ token, user }) {
        if (user) {
          token.uid = Number(user.id);
          token.role = user.role;
        }
        return token;
      },
      session({ session, token }) {
        session.user = { ...session.user, id: token.uid, role: token.role };
        return session;
      },
    },
  };
}
