import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";

const root = join(import.meta.dirname, "..", "..");
/** The one client: everything the browser sends to the API goes through it. */
const CLIENT = "lib/api-client.ts";
/** A call of the global fetch (window.fetch( too), not apiFetch( refetch( or prefetch(. */
const RAW_FETCH = /(?<![A-Za-z0-9_$])fetch\s*\(/;

function sources(dir: string): string[] {
  return readdirSync(join(root, dir)).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(join(root, path)).isDirectory()) return sources(path);
    return /\.(ts|tsx)$/.test(name) ? [path] : [];
  });
}

describe("one way to save from the browser", () => {
  it("finds a raw fetch when there is one (the pattern itself)", () => {
    expect(RAW_FETCH.test('await fetch("/api/x")')).toBe(true);
    expect(RAW_FETCH.test("window.fetch(url)")).toBe(true);
    expect(RAW_FETCH.test("apiFetch(url); refetch(); router.prefetch(url)")).toBe(false);
  });

  it("has no fetch( in components/ or app/: they go through lib/api-client.ts", () => {
    const offenders = [...sources("components"), ...sources("app")]
      .map((path) => relative(root, join(root, path)))
      .filter((path) => path !== CLIENT)
      .filter((path) => RAW_FETCH.test(readFileSync(join(root, path), "utf8")));
    expect(offenders).toEqual([]);
  });
});
