import { afterEach, describe, expect, it, vi } from "vitest";
import { authSecret, MIN_SECRET_LENGTH, resetEnvCache, startupProblems } from "@/lib/env";

// Settings that used to start a server which then failed on signed-in pages (a 500) now stop it
// at start (instrumentation.ts calls startupProblems and exits with the message).

const SHORT = "sixteen-chars-ok"; // 16 characters: the old minimum
const LONG = "0123456789abcdef0123456789abcdef"; // 32 characters

afterEach(() => {
  vi.unstubAllEnvs();
  resetEnvCache();
});

describe("start-up checks", () => {
  it("refuse a production session secret shorter than 32 characters, saying how long it is", () => {
    expect(MIN_SECRET_LENGTH).toBe(32);
    const problems = startupProblems({ NODE_ENV: "production", NEXTAUTH_SECRET: SHORT });
    expect(problems).toEqual([expect.stringMatching(/^NEXTAUTH_SECRET is 16 characters long/)]);
    expect(problems[0]).toContain("at least 32");
  });

  it("refuse production with no session secret at all", () => {
    expect(startupProblems({ NODE_ENV: "production" })).toEqual([
      expect.stringMatching(/^NEXTAUTH_SECRET is not set/),
    ]);
  });

  it("accept 32 characters in production, and anything outside production", () => {
    expect(startupProblems({ NODE_ENV: "production", NEXTAUTH_SECRET: LONG })).toEqual([]);
    expect(startupProblems({ NODE_ENV: "development", NEXTAUTH_SECRET: "short" })).toEqual([]);
  });

  it("refuse a setting that cannot be read, naming it", () => {
    const problems = startupProblems({
      NODE_ENV: "production",
      NEXTAUTH_SECRET: LONG,
      UPLOAD_MAX_MB: "lots",
    });
    expect(problems).toEqual([expect.stringMatching(/^UPLOAD_MAX_MB: /)]);
    expect(startupProblems({ NODE_ENV: "development", HSTS: "maybe" })).toEqual([
      expect.stringMatching(/^HSTS: /),
    ]);
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
