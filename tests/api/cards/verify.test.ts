import { Document, Page, renderToBuffer, Text } from "@react-pdf/renderer";
import { createElement as h } from "react";
import { beforeEach, describe, expect, it } from "vitest";
import { GET as downloadCard } from "@/app/api/jobs/[id]/cards/[revision]/pdf/route";
import { POST as postCard } from "@/app/api/jobs/[id]/cards/route";
import { GET as getVerified } from "@/app/api/verify/[code]/route";
import { POST as postCheck } from "@/app/api/verify/check/route";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { CardSummary } from "@/lib/cards/summary";
import type { VerifiedCard } from "@/lib/cards/verify";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { createFourCylinderJob, createV8Job } from "./fixtures";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createV8Job(db, users.customer.customerId!);
});

async function issue(jobId: number): Promise<CardSummary> {
  signInAs(users.machinist);
  // The demo V8 has a wrist pin over the band (to re-select): issued with a stated reason.
  const body = { override: true, overrideReason: "Spare pin on order" };
  const res = await postCard(jsonRequest("POST", "/x", body), params({ id: String(jobId) }));
  expect(res.status).toBe(201);
  return (await res.json()).card;
}

async function pdfOf(jobId: number, revision: number): Promise<Uint8Array> {
  signInAs(users.machinist);
  const res = await downloadCard(
    jsonRequest("GET", "/x"),
    params({ id: String(jobId), revision: String(revision) }),
  );
  return new Uint8Array(await res.arrayBuffer());
}

function verify(code: string) {
  return getVerified(jsonRequest("GET", `/api/verify/${code}`), params({ code }));
}

function check(bytes: Uint8Array, name = "card.pdf") {
  const form = new FormData();
  form.set("file", new File([Buffer.from(bytes)], name, { type: "application/pdf" }));
  return postCheck(
    new Request("http://localhost/api/verify/check", { method: "POST", body: form }),
    params({}),
  );
}

describe("verifying a card by its code (public)", () => {
  it("shows the key figures to anyone, signed in or not", async () => {
    const card = await issue(job.id);
    signInAs(null);
    const res = await verify(card.verificationCode);
    expect(res.status).toBe(200);
    const verified: VerifiedCard = (await res.json()).card;
    expect(verified).toMatchObject({
      verificationCode: card.verificationCode,
      revision: 1,
      status: "current",
      supersededByRevision: null,
      shopName: "Our balancing shop",
      jobNumber: job.number,
      engine: job.engine,
      sha256: card.sha256,
      crank: { grade: "6.3", pass: true },
      bobweights: { needed: true, unit: "g" },
    });
    // 1891.0 g worked out (rotating + ½ reciprocating): printed one decimal finer than the scale.
    expect(verified.bobweights.perPin[0]).toMatchObject({ crankpin: 1, printed: "1891.00" });
  });

  it("reads a code typed in lower case, without the dash, or with O for 0", async () => {
    const card = await issue(job.id);
    signInAs(null);
    const typed = card.verificationCode.toLowerCase().replace("-", "").replace(/0/g, "o");
    expect((await verify(typed)).status).toBe(200);
  });

  it("says a revision is superseded, and by which", async () => {
    const first = await issue(job.id);
    await issue(job.id);
    signInAs(null);
    const verified: VerifiedCard = (await (await verify(first.verificationCode)).json()).card;
    expect(verified).toMatchObject({ revision: 1, status: "superseded", supersededByRevision: 2 });
  });

  it("answers the same 404 for an unknown code and for one that cannot be a code", async () => {
    await issue(job.id);
    signInAs(null);
    const unknown = await verify("ZZZZZ-ZZZZZ");
    const malformed = await verify("../../etc/passwd");
    expect(unknown.status).toBe(404);
    expect(malformed.status).toBe(404);
    expect(await unknown.json()).toEqual(await malformed.json());
  });

  it("reveals nothing of the customer: no name or e-mail", async () => {
    const card = await issue(job.id);
    signInAs(null);
    const text = await (await verify(card.verificationCode)).text();
    expect(users.customer.email).toBeTruthy();
    expect(text).not.toContain("@example.test");
    expect(text).not.toContain(users.customer.email);
    expect(text).not.toContain("Wren Talbot");
    expect(Object.keys(JSON.parse(text).card)).not.toContain("customer");
  });
});

describe("checking an uploaded PDF (public)", () => {
  it("calls the very file we issued genuine, with its code and revision", async () => {
    const card = await issue(job.id);
    const bytes = await pdfOf(job.id, 1);
    signInAs(null);
    const res = await check(bytes);
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({
      result: "genuine",
      sha256: card.sha256,
      card: { verificationCode: card.verificationCode, revision: 1, status: "current" },
    });
  });

  it("calls it altered when one byte in the middle is changed", async () => {
    const card = await issue(job.id);
    const bytes = await pdfOf(job.id, 1);
    const tampered = new Uint8Array(bytes);
    const middle = Math.floor(tampered.length / 2);
    tampered[middle] = tampered[middle]! ^ 0x01;
    signInAs(null);
    const body = await (await check(tampered)).json();
    expect(body).toMatchObject({
      result: "altered",
      card: { verificationCode: card.verificationCode, revision: 1 },
    });
    expect(body.sha256).not.toBe(card.sha256);
  });

  it("tells a superseded genuine file from the current one", async () => {
    await issue(job.id);
    const bytes = await pdfOf(job.id, 1);
    await issue(job.id);
    signInAs(null);
    expect(await (await check(bytes)).json()).toMatchObject({
      result: "genuine",
      card: { revision: 1, status: "superseded", supersededByRevision: 2 },
    });
  });

  it("calls an unrelated PDF unknown", async () => {
    await issue(job.id);
    const other = await renderToBuffer(
      h(Document, null, h(Page, null, h(Text, null, "Packing list, nothing to do with balancing"))),
    );
    signInAs(null);
    expect(await (await check(new Uint8Array(other))).json()).toMatchObject({ result: "unknown" });
  });

  it("calls a card from a code that was never issued unknown, not altered", async () => {
    const four = await createFourCylinderJob(db, users.customer.customerId!);
    await issue(four.id);
    const bytes = Buffer.from(await pdfOf(four.id, 1));
    const raw = bytes
      .toString("latin1")
      .replace(/counterpoise-card [0-9A-Z]{10}/, "counterpoise-card ZZZZZZZZZZ")
      .replace(/verification code [0-9A-Z]{5}-[0-9A-Z]{5}/, "verification code ZZZZZ-ZZZZZ");
    signInAs(null);
    expect(await (await check(Buffer.from(raw, "latin1"))).json()).toMatchObject({
      result: "unknown",
    });
  });

  it("refuses a file that is not a PDF (422), whatever its name says", async () => {
    signInAs(null);
    const res = await check(new TextEncoder().encode("just some text, not a card"), "card.pdf");
    expect(res.status).toBe(422);
    expect((await res.json()).error).toMatchObject({
      code: "unsupported_type",
      fields: { file: expect.any(String) },
    });
    const png = Buffer.from("89504e470d0a1a0a0000000d49484452", "hex");
    expect((await check(png, "card.pdf")).status).toBe(422);
  });

  it("refuses a file over the size limit (413) before reading it all", async () => {
    signInAs(null);
    const big = new Uint8Array(6 * 1024 * 1024);
    big.set(new TextEncoder().encode("%PDF-1.4\n"));
    expect((await check(big)).status).toBe(413);
  });
});
