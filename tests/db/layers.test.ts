import { readdirSync, readFileSync } from "node:fs";
import { join, relative, sep } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

// The layers, read from the source: db/ holds repositories (functions that take the database or
// a transaction first and run SQL; no transaction of their own, no business rule, nothing from
// lib/ but the configuration), lib/ services own the transactions and the rules, and no SQL is
// written anywhere else. Every file is read (a directory listing, not a list kept by hand), so a
// new module is checked the day it is added. scripts/ is not read: a script may use db/ directly.

const root = new URL("../../", import.meta.url);

/** Every TypeScript file under `dir`, as a path from the repository root. */
function sourceFiles(dir: string): string[] {
  const entries = readdirSync(new URL(`${dir}/`, root), { recursive: true, withFileTypes: true });
  return entries
    .filter((e) => e.isFile() && /\.(ts|tsx|mts)$/.test(e.name) && !e.name.endsWith(".d.ts"))
    .map((e) => relative(fileURLToPath(root), join(e.parentPath, e.name)).split(sep).join("/"))
    .sort();
}

const read = (path: string) => readFileSync(new URL(path, root), "utf8");

/** "path:line: text" for each line of each file that matches. */
function linesMatching(paths: string[], pattern: RegExp): string[] {
  return paths.flatMap((path) =>
    read(path)
      .split("\n")
      .flatMap((text, i) => (pattern.test(text) ? [`${path}:${i + 1}: ${text.trim()}`] : [])),
  );
}

const dbFiles = sourceFiles("db");

// An import of app code from db/: "@/lib/…" or a relative path up into lib/, but not lib/env.
const LIB_IMPORT = /from\s+["'](?:@\/|(?:\.\.\/)+)lib\/(?!env["'])/;
// Kysely's query builders and its sql template (also with a type argument, sql<T>`…`).
const SQL_BUILDER = /\b(?:selectFrom|insertInto|updateTable|deleteFrom|replaceInto|mergeInto)\(/;
const SQL_TEMPLATE = /\bsql(?:<[^`>]*>)?`|\bsql\.(?:raw|ref|table|id|lit|join|val)\(/;

describe("db/ holds repositories only", () => {
  it("reads the modules it checks from the directory", () => {
    // The ones this layering started from must be among them; a rename would otherwise make the
    // checks below pass on nothing.
    for (const m of ["db/weights.ts", "db/jobs.ts", "db/cards.ts", "db/invoices.ts"]) {
      expect(dbFiles).toContain(m);
    }
    expect(dbFiles.length).toBeGreaterThan(20);
  });

  it("opens no transaction in any db/ module (the lib/ service that calls it owns it)", () => {
    expect(linesMatching(dbFiles, /\.transaction\(/)).toEqual([]);
  });

  it("imports nothing from lib/ in any db/ module but the configuration (lib/env)", () => {
    expect(linesMatching(dbFiles, LIB_IMPORT)).toEqual([]);
  });

  it("catches what it looks for", () => {
    // The patterns above, tried on lines they must and must not flag.
    expect(LIB_IMPORT.test(`import { env } from "@/lib/env";`)).toBe(false);
    expect(LIB_IMPORT.test(`import { HttpError } from "@/lib/http/errors";`)).toBe(true);
    expect(LIB_IMPORT.test(`import { x } from "../lib/balance";`)).toBe(true);
    expect(SQL_BUILDER.test(`await trx.selectFrom("jobs")`)).toBe(true);
    expect(SQL_BUILDER.test(`db.deleteFrom("uploads")`)).toBe(true);
    expect(SQL_BUILDER.test(`const selectFromList = 1;`)).toBe(false);
    expect(SQL_TEMPLATE.test("await sql`select 1`.execute(db)")).toBe(true);
    expect(SQL_TEMPLATE.test("sql<{ n: number }>`select count(*) as n`")).toBe(true);
    expect(SQL_TEMPLATE.test("const mysql = `x`;")).toBe(false);
  });
});

describe("no SQL outside db/", () => {
  const outside = ["lib", "app", "components"].flatMap(sourceFiles);

  it("reads lib/, app/ and components/", () => {
    expect(outside).toContain("lib/workshop/save-weight.ts");
    expect(outside.some((p) => p.startsWith("app/api/"))).toBe(true);
    expect(outside.some((p) => p.startsWith("components/"))).toBe(true);
  });

  it("builds no query outside db/ (selectFrom, insertInto, updateTable, deleteFrom)", () => {
    expect(linesMatching(outside, SQL_BUILDER)).toEqual([]);
  });

  it("writes no sql template outside db/", () => {
    expect(linesMatching(outside, SQL_TEMPLATE)).toEqual([]);
  });
});
