import { afterEach, describe, expect, it, vi } from "vitest";
import { authSecret, MIN_SECRET_LENGTH, resetEnvCache, startupProblems } from "@/lib/env";

// Settings that used to start a server which then failed on signed-in pages (a 500) now stop it
// at start (instrumentation.ts calls startupProblems and exits with the message).

const SHORT = "sixteen-chars-ok"; // 16 characters: the old minimum
const LONG = "0123456789abcdef0123456789abcdef"; // 32 characters
// 32 bytes in base64: 32 / 3 = 10 groups and 2 bytes over, so 11 groups of 4 with one "=" (44).
const KEY = Buffer.alloc(32, 7).toString("base64");

afterEach(() => {
  vi.unstubAllEnvs();
  resetEnvCache();
});

describe("start-up checks", () => {
  it("refuse a production session secret shorter than 32 characters, saying how long it is", () => {
    expect(MIN_SECRET_LENGTH).toBe(32);
    const problems = startupProblems({
      NODE_ENV: "production",
      NEXTAUTH_SECRET: SHORT,
      NEXT_SERVER_ACTIONS_ENCRYPTION_KEY: KEY,
    });
    expect(problems).toEqual([expect.stringMatching(/^NEXTAUTH_SECRET is 16 characters long/)]);
    expect(problems[0]).toContain("at least 32");
  });

  it("refuse production with no session secret at all", () => {
    expect(
      startupProblems({ NODE_ENV: "production", NEXT_SERVER_ACTIONS_ENCRYPTION_KEY: KEY }),
    ).toEqual([expect.stringMatching(/^NEXTAUTH_SECRET is not set/)]);
  });

  it("accept 32 characters in production, and anything outside production", () => {
    expect(KEY).toHaveLength(44);
    expect(
      startupProblems({
        NODE_ENV: "production",
        NEXTAUTH_SECRET: LONG,
        NEXT_SERVER_ACTIONS_ENCRYPTION_KEY: KEY,
      }),
    ).toEqual([]);
    expect(startupProblems({ NODE_ENV: "development", NEXTAUTH_SECRET: "short" })).toEqual([]);
  });

  it("refuse a setting that cannot be read, naming it", () => {
    const problems = startupProblems({
      NODE_ENV: "production",
      NEXTAUTH_SECRET: LONG,
      NEXT_SERVER_ACTIONS_ENCRYPTION_KEY: KEY,
      UPLOAD_MAX_MB: "lots",
    });
    expect(problems).toEqual([expect.stringMatching(/^UPLOAD_MAX_MB: /)]);
    expect(startupProblems({ NODE_ENV: "development", HSTS: "maybe" })).toEqual([
      expect.stringMatching(/^HSTS: /),
    ]);
  });

  it("refuse production without the server-actions key, or with one that is not an AES key", () => {
    const base = { NODE_ENV: "production", NEXTAUTH_SECRET: LONG } as const;
    expect(startupProblems(base)).toEqual([
      expect.stringMatching(/^NEXT_SERVER_ACTIONS_ENCRYPTION_KEY is not set/),
    ]);
    // AES takes 128, 192 or 256-bit keys (FIPS 197): 16, 24 or 32 bytes; 20 bytes is none of
    // them, and "c2hvcnQ=" is the 5 bytes of "short" (RFC 4648 base64).
    for (const bad of [Buffer.alloc(20, 1).toString("base64"), "not base64!", "c2hvcnQ="]) {
      expect(startupProblems({ ...base, NEXT_SERVER_ACTIONS_ENCRYPTION_KEY: bad })).toEqual([
        expect.stringMatching(/^NEXT_SERVER_ACTIONS_ENCRYPTION_KEY is not the base64/),
      ]);
    }
    for (const bytes of [16, 24, 32]) {
      const key = Buffer.alloc(bytes, 9).toString("base64");
      expect(startupProblems({ ...base, NEXT_SERVER_ACTIONS_ENCRYPTION_KEY: key })).toEqual([]);
    }
    expect(startupProblems({ NODE_ENV: "development" })).toEqual([]);
  });

  it("also stop a server that was started anyway from signing anything with the short secret", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("NEXTAUTH_SECRET", SHORT);
    resetEnvCache();
    expect(() => authSecret()).toThrow(/NEXTAUTH_SECRET is 16 characters long/);
    vi.stubEnv("NEXTAUTH_SECRET", LONG);
    resetEnvCache();
    expect(authSecret()).toBe(LONG);
  });
});
