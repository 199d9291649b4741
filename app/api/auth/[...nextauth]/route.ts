import NextAuth from "next-auth";
import { NextResponse } from "next/server";
import { authOptions } from "@/lib/auth/options";
import { spendRateLimit } from "@/lib/auth/rate-limit";
import { HttpError } from "@/lib/http/errors";

function handler(req: Request, ctx: { params: Promise<{ nextauth: string[] }> }) {
  return NextAuth(authOptions())(req, ctx);
}

/**
 * A sign-in post is rate-limited per address first (lib/auth/rate-limit.ts). The refusal is a
 * 429 with Retry-After and the usual error body, plus the `url` next-auth's own client reads
 * its error from, so the sign-in form shows the message.
 */
async function post(req: Request, ctx: { params: Promise<{ nextauth: string[] }> }) {
  const path = new URL(req.url).pathname;
  if (req.method === "POST" && path.endsWith("/callback/credentials")) {
    try {
      await spendRateLimit("sign-in", req.headers);
    } catch (error) {
      if (!(error instanceof HttpError) || error.status !== 429) throw error;
      const url = new URL("/sign-in", req.url);
      url.searchParams.set("error", error.message);
      return NextResponse.json(
        { error: { code: error.code, message: error.message }, url: url.toString() },
        { status: 429, headers: error.headers },
      );
    }
  }
  return handler(req, ctx);
}

export { handler as GET, post as POST };
