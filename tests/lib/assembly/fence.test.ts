import { readdirSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

const root = fileURLToPath(new URL("../../../lib/assembly/", import.meta.url));
const sources = readdirSync(root).filter((name) => name.endsWith(".ts"));

describe("the engine build computations are fenced", () => {
  it("has sources to check", () => {
    expect(sources).toContain("index.ts");
  });

  it.each(sources)("%s imports only decimal.js and its own modules", (name) => {
    const text = readFileSync(root + name, "utf8");
    const specifiers = [...text.matchAll(/(?:import|export)[^"']*?from\s+["']([^"']+)["']/g)].map(
      (m) => m[1],
    );
    for (const specifier of specifiers) expect(specifier).toMatch(/^(decimal\.js|\.\/[a-z-]+)$/);
    expect(text).not.toMatch(/process\.env|\brequire\(|import\(/);
  });

  it("is type-checked on its own by npm run typecheck", () => {
    const pkg = JSON.parse(readFileSync(new URL("../../../package.json", import.meta.url), "utf8"));
    expect(pkg.scripts.typecheck).toContain("tsc --noEmit -p lib/assembly/tsconfig.json");
  });
});
