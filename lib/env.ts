import { z } from "zod";

// Every setting the app reads from the environment, validated once. `.env.example` lists them all.
const schema = z.object({
  DATABASE_PATH: z.string().min(1).default("data/counterpoise.db"),
  NEXTAUTH_SECRET: z.string().min(16).optional(),
  NEXTAUTH_URL: z.string().url().optional(),
  SIGN_IN_MAX_FAILURES: z.coerce.number().int().positive().default(5),
  SIGN_IN_LOCKOUT_MINUTES: z.coerce.number().int().positive().default(15),
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
});

export type Env = z.infer<typeof schema>;

let cached: Env | undefined;

export function env(): Env {
  cached ??= schema.parse(process.env);
  return cached;
}

/** For tests that change an environment variable between cases. */
export function resetEnvCache(): void {
  cached = undefined;
}

/** The signing secret; required outside development and tests. */
export function authSecret(): string {
  const { NEXTAUTH_SECRET, NODE_ENV } = env();
  if (NEXTAUTH_SECRET) return NEXTAUTH_SECRET;
  if (NODE_ENV === "production") {
    throw new Error("NEXTAUTH_SECRET must be set (at least 16 characters) to run in production.");
  }
  return "counterpoise-development-secret-not-for-production";
}
