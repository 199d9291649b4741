import { beforeEach, describe, expect, it, vi } from "vitest";
import { POST as postCard } from "@/app/api/jobs/[id]/cards/route";
import { POST as postCheck } from "@/app/api/verify/check/route";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { MAX_CODES_PER_CHECK } from "@/lib/cards/verify";
import { createV8Job } from "../api/cards/fixtures";
import { addOneOfEachRole, freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

// The public card check reads every verification code a PDF names. A file naming tens of
// thousands of codes once went to the database in one query and failed ("too many SQL
// variables", a 500); SQLite's limit on values bound in one statement is 32 766 by default
// since 3.32 (sqlite.org/limits.html, SQLITE_MAX_VARIABLE_NUMBER).

const ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ"; // the codes' base-32 letters

/** The n-th of many distinct 10-letter codes. */
function code(n: number): string {
  let s = "";
  for (let i = 0; i < 10; i++) {
    s = ALPHABET[n % 32]! + s;
    n = Math.floor(n / 32);
  }
  return s;
}

/** A file that starts like a PDF and names these codes the way our cards do. */
function pdfNaming(codes: string[]): Uint8Array {
  const marks = codes.map((c) => `counterpoise-card ${c}`).join("\n");
  return new TextEncoder().encode(`%PDF-1.4\n% ${marks}\n%%EOF\n`);
}

function check(bytes: Uint8Array) {
  const form = new FormData();
  form.set("file", new File([Buffer.from(bytes)], "card.pdf", { type: "application/pdf" }));
  return postCheck(
    new Request("http://localhost/api/verify/check", { method: "POST", body: form }),
    params({}),
  );
}

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  signInAs(null);
});

describe("checking a PDF that names many codes", () => {
  it("refuses 32 767 codes with 422 on the file, not a 500", async () => {
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    const codes = Array.from({ length: 32_767 }, (_, i) => code(i + 1));
    const res = await check(pdfNaming(codes));
    expect(res.status).toBe(422);
    const { error } = await res.json();
    expect(error.code).toBe("too_many_codes");
    expect(error.fields.file).toMatch(/names 32767 verification codes; a balance card names one/);
    expect(logged).not.toHaveBeenCalled();
    logged.mockRestore();
  });

  it("still finds our card's code at the end of the most codes one check reads", async () => {
    signInAs(users.machinist);
    const job = await createV8Job(db, users.customer.customerId!);
    const issued = await postCard(
      jsonRequest("POST", "/x", { override: true, overrideReason: "Spare pin on order" }),
      params({ id: String(job.id) }),
    );
    const ours = ((await issued.json()).card.verificationCode as string).replace("-", "");
    signInAs(null);
    // 199 codes that were never issued, then ours: more than one query's worth (100).
    const codes = [...Array.from({ length: MAX_CODES_PER_CHECK - 1 }, (_, i) => code(i + 1)), ours];
    const res = await check(pdfNaming(codes));
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ result: "altered", card: { jobNumber: job.number } });
    expect(MAX_CODES_PER_CHECK).toBe(200);
  });
});
