import { createHash } from "node:crypto";
import { sql } from "kysely";
import { beforeEach, describe, expect, it } from "vitest";
import { GET as downloadCard } from "@/app/api/jobs/[id]/cards/[revision]/pdf/route";
import { GET as listCards, POST as postCard } from "@/app/api/jobs/[id]/cards/route";
import type { DB } from "@/db/client";
import { type Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { savePartWeight } from "@/lib/workshop/save-weight";
import { listAuditEntries } from "@/db/audit";
import type { CardSummary } from "@/lib/cards/summary";
import { addOneOfEachRole, addTestCustomer, freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { createFourCylinderJob, readPdf } from "./fixtures";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createFourCylinderJob(db, users.customer.customerId!);
});

function issue(jobId: number, body?: unknown, query = "") {
  return postCard(
    jsonRequest("POST", `/api/jobs/${jobId}/cards${query}`, body),
    params({ id: String(jobId) }),
  );
}

async function issueOk(jobId: number, body?: unknown): Promise<CardSummary> {
  const res = await issue(jobId, body);
  expect(res.status).toBe(201);
  return (await res.json()).card;
}

function download(jobId: number, revision: number | string) {
  return downloadCard(
    jsonRequest("GET", `/api/jobs/${jobId}/cards/${revision}/pdf`),
    params({ id: String(jobId), revision: String(revision) }),
  );
}

async function list(jobId: number): Promise<Response> {
  return listCards(jsonRequest("GET", `/api/jobs/${jobId}/cards`), params({ id: String(jobId) }));
}

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

describe("issuing a balance card", () => {
  it("lets a machinist issue revision 1, stored with its hash, code and issuer", async () => {
    signInAs(users.machinist);
    const card = await issueOk(job.id);
    expect(card).toMatchObject({
      revision: 1,
      pageSize: "A4",
      current: true,
      supersededAt: null,
      issuedBy: { id: users.machinist.id, name: users.machinist.name },
      pdfUrl: `/api/jobs/${job.id}/cards/1/pdf`,
    });
    expect(card.verificationCode).toMatch(/^[0-9A-Z]{5}-[0-9A-Z]{5}$/);
    expect(card.verifyUrl).toMatch(
      new RegExp(`^https?://[^/]+/verify/${card.verificationCode.replace("-", "")}$`),
    );
    const audit = await listAuditEntries(db, "job", job.id);
    expect(audit[0]).toMatchObject({ action: "issue-card", user_id: users.machinist.id });
  });

  it("lets the owner issue too, on US Letter when asked (body or query)", async () => {
    signInAs(users.owner);
    expect((await issueOk(job.id, { pageSize: "Letter" })).pageSize).toBe("LETTER");
    const res = await issue(job.id, undefined, "?pageSize=a4");
    expect((await res.json()).card.pageSize).toBe("A4");
  });

  it("refuses the counter and the customer (403) and writes nothing", async () => {
    for (const role of ["counter", "customer"] as const) {
      signInAs(users[role]);
      const res = await issue(job.id);
      expect(res.status, role).toBe(403);
    }
    signInAs(null);
    expect((await issue(job.id)).status).toBe(401);
    signInAs(users.owner);
    expect((await (await list(job.id)).json()).cards).toEqual([]);
  });

  it("refuses a job whose weigh-in is not complete with 422 naming the missing parts", async () => {
    const half = await createJob(
      db,
      {
        customerId: users.customer.customerId!,
        engine: "x",
        spec: { layout: "inline-4", cylinders: 4 },
      },
      null,
    );
    await savePartWeight(
      db,
      {
        jobId: half.id,
        cylinder: 1,
        kind: "piston",
        phase: "initial",
        readings: ["400"],
        baseVersion: 0,
      },
      null,
    );
    signInAs(users.machinist);
    const res = await issue(half.id);
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("weigh_in_incomplete");
    expect(body.error.message).toMatch(
      /^The weigh-in is not complete: 15 parts have no weight yet \(cylinder 1 wrist pin,/,
    );
    expect(body.error.fields).toHaveProperty("weights");
  });

  it("answers 404 for a job that does not exist and 422 for a paper size we do not print", async () => {
    signInAs(users.machinist);
    expect((await issue(9999)).status).toBe(404);
    const res = await issue(job.id, { pageSize: "A3" });
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("pageSize");
    expect((await issue(job.id, "{not json")).status).toBe(400);
  });
});

describe("revisions", () => {
  it("makes revision 2 after a correction; revision 1 stays, byte for byte, marked superseded", async () => {
    signInAs(users.machinist);
    await issueOk(job.id);
    const first = await download(job.id, 1);
    const firstBytes = new Uint8Array(await first.arrayBuffer());

    // A correction after issue: cylinder 2's piston re-weighed after machining.
    await savePartWeight(
      db,
      {
        jobId: job.id,
        cylinder: 2,
        kind: "piston",
        phase: "final",
        readings: ["400.2"],
        baseVersion: 0,
      },
      users.machinist.id,
    );
    const second = await issueOk(job.id);
    expect(second).toMatchObject({ revision: 2, current: true });
    expect(
      (await readPdf(new Uint8Array(await (await download(job.id, 2)).arrayBuffer()))).text,
    ).toContain("replaces revision 1");

    const cards: CardSummary[] = (await (await list(job.id)).json()).cards;
    expect(cards.map((c) => [c.revision, c.current, c.supersededByRevision])).toEqual([
      [2, true, null],
      [1, false, 2],
    ]);
    expect(cards[1]!.supersededAt).toBe(second.issuedAt);

    const again = await download(job.id, 1);
    expect(again.status).toBe(200);
    const againBytes = new Uint8Array(await again.arrayBuffer());
    expect(sha256(againBytes)).toBe(sha256(firstBytes));
    expect(sha256(againBytes)).toBe(cards[1]!.sha256);
    expect(cards[0]!.sha256).not.toBe(cards[1]!.sha256);
    expect(cards[0]!.verificationCode).not.toBe(cards[1]!.verificationCode);
  });

  it("never lets an issued card change or be deleted, even by a direct write", async () => {
    signInAs(users.machinist);
    await issueOk(job.id);
    await expect(
      sql`update balance_cards set pdf = ${Buffer.from([0])} where revision = 1`.execute(db),
    ).rejects.toThrow(/never changes/);
    await expect(sql`update balance_cards set data_json = '{}'`.execute(db)).rejects.toThrow(
      /never changes/,
    );
    await expect(sql`update balance_cards set sha256 = 'x'`.execute(db)).rejects.toThrow(
      /never changes/,
    );
    await expect(sql`delete from balance_cards`.execute(db)).rejects.toThrow(/kept/);
    await issueOk(job.id);
    // The superseded mark is set once, when the next revision is issued, and then stays.
    await expect(
      sql`update balance_cards set superseded_at = null where revision = 1`.execute(db),
    ).rejects.toThrow(/never changes/);
  });
});

describe("downloading", () => {
  it("sends the stored PDF as an attachment with a safe name, its hash matching the list", async () => {
    signInAs(users.machinist);
    const card = await issueOk(job.id);
    signInAs(users.customer);
    const res = await download(job.id, 1);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toBe(
      `attachment; filename="balance-card-${job.number}-r1.pdf"; filename*=UTF-8''balance-card-${job.number}-r1.pdf`,
    );
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect(Buffer.from(bytes.subarray(0, 5)).toString("latin1")).toBe("%PDF-");
    expect(sha256(bytes)).toBe(card.sha256);
  });

  it("lets a customer list and download their own job's cards, and no one else's (404)", async () => {
    const other = await addTestCustomer(db, "Ottilie Farrant");
    const otherJob = await createFourCylinderJob(db, other.id);
    signInAs(users.owner);
    await issueOk(job.id);
    await issueOk(otherJob.id);

    signInAs(users.customer);
    expect((await list(job.id)).status).toBe(200);
    expect((await download(job.id, 1)).status).toBe(200);
    expect((await list(otherJob.id)).status).toBe(404);
    const res = await download(otherJob.id, 1);
    expect(res.status).toBe(404);
    expect(await res.json()).toEqual({ error: { code: "not_found", message: "No such job." } });
  });

  it("answers 404 for a revision that was never issued or is not a number", async () => {
    signInAs(users.counter);
    expect((await download(job.id, 1)).status).toBe(404);
    expect((await download(job.id, "1.5")).status).toBe(404);
    expect((await download(job.id, "latest")).status).toBe(404);
  });
});
