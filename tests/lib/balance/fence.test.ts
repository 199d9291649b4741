import { readdirSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

const root = fileURLToPath(new URL("../../../lib/balance/", import.meta.url));
const sources = readdirSync(root).filter((name) => name.endsWith(".ts"));

describe("the calculation core is fenced", () => {
  it.each(sources)("%s imports only decimal.js and its own modules", (name) => {
    const text = readFileSync(root + name, "utf8");
    const specifiers = [...text.matchAll(/(?:import|export)[^"']*?from\s+["']([^"']+)["']/g)].map(
      (m) => m[1],
    );
    for (const specifier of specifiers) expect(specifier).toMatch(/^(decimal\.js|\.\/[a-z-]+)$/);
    expect(text).not.toMatch(/process\.env|\brequire\(|import\(/);
  });
});
