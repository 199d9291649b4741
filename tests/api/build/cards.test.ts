import { createHash } from "node:crypto";
import { beforeEach, describe, expect, it } from "vitest";
import { POST as sendCard } from "@/app/api/jobs/[id]/build/cards/[revision]/send/route";
import { GET as getPdf } from "@/app/api/jobs/[id]/build/cards/[revision]/pdf/route";
import { GET as listCards, POST as issueCard } from "@/app/api/jobs/[id]/build/cards/route";
import { PUT as putSection } from "@/app/api/jobs/[id]/build/[section]/route";
import type { DB } from "@/db/client";
import { StaleWriteError } from "@/db/errors";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { storeBuildCard, verifyBuildCardCode } from "@/lib/build-record/card";
import { emptySection } from "@/lib/build-record/schemas";
import { addTestUser } from "../../helpers/db";
import { setUpBuildJob } from "./fixtures";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  ({ db, users, job } = await setUpBuildJob());
  signInAs(users.machinist);
});

const id = () => ({ id: String(job.id) });
type Card = { revision: number; sha256: string; verificationCode: string };

async function record() {
  const specs = {
    ...emptySection("specs", "in"),
    bore: "4.030",
    ringFactors: { top: "0.0045", second: null, oil: null },
  };
  await putSection(
    jsonRequest("PUT", "/x", { version: 0, data: specs }),
    params({ ...id(), section: "specs" }),
  );
  await putSection(
    jsonRequest("PUT", "/x", {
      version: 0,
      data: { rows: [{ cylinder: 1, ring: "top", readings: ["0.015", "0.019"], done: true }] },
    }),
    params({ ...id(), section: "rings" }),
  );
}

async function issue(): Promise<Card> {
  const res = await issueCard(jsonRequest("POST", "/x"), params(id()));
  expect(res.status).toBe(201);
  return ((await res.json()) as { card: Card }).card;
}

describe("the issued build record PDF", () => {
  it("is stored with the hash of its bytes and read back exactly as issued", async () => {
    await record();
    const card = await issue();
    expect(card.revision).toBe(1);
    const res = await getPdf(jsonRequest("GET", "/x"), params({ ...id(), revision: "1" }));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const bytes = Buffer.from(await res.arrayBuffer());
    expect(bytes.subarray(0, 5).toString()).toBe("%PDF-");
    expect(createHash("sha256").update(bytes).digest("hex")).toBe(card.sha256);
  });

  it("its code verifies publicly with the figures it printed; a new revision supersedes it", async () => {
    await record();
    const first = await issue();
    const verified = await verifyBuildCardCode(db, first.verificationCode.toLowerCase());
    expect(verified?.status).toBe("current");
    const rings = verified!.tables.find((t) => t.title.startsWith("Ring gaps"))!;
    // 0.0045 × 4.030 = 0.018135 in, shown one digit finer than the 0.019 feeler reading: 0.0181.
    expect(rings.rows[0]).toEqual(["1", "Top", "0.0181", "0.019", "0.015", "in gap, done"]);
    const second = await issue();
    expect(second.revision).toBe(2);
    expect((await verifyBuildCardCode(db, first.verificationCode))?.status).toBe("superseded");
    expect(await verifyBuildCardCode(db, "00000-00000")).toBeUndefined();
    const list = await listCards(jsonRequest("GET", "/x"), params(id()));
    expect(((await list.json()) as { cards: Card[] }).cards.map((c) => c.revision)).toEqual([2, 1]);
  });

  it("is refused with nothing recorded (422), to the counter (403), and someone else's job is 404", async () => {
    const empty = await issueCard(jsonRequest("POST", "/x"), params(id()));
    expect(empty.status).toBe(422);
    expect(((await empty.json()) as { error: { fields: object } }).error.fields).toHaveProperty(
      "record",
    );
    await record();
    signInAs(users.counter);
    expect((await issueCard(jsonRequest("POST", "/x"), params(id()))).status).toBe(403);
    signInAs(await addTestUser(db, "customer"));
    expect((await listCards(jsonRequest("GET", "/x"), params(id()))).status).toBe(404);
    signInAs(users.counter);
    const res = await sendCard(jsonRequest("POST", "/x", {}), params({ ...id(), revision: "9" }));
    expect(res.status).toBe(404);
  });

  it("two issues taking the same revision at once: the second is stale (409)", async () => {
    const card = {
      jobId: job.id,
      revision: 1,
      pdf: Buffer.from("%PDF-1.4"),
      sha256: "0".repeat(64),
      dataJson: "{}",
      issuedAt: new Date().toISOString(),
    };
    await storeBuildCard(db, { ...card, verificationCode: "AAAAAAAAAA" }, null);
    await expect(
      storeBuildCard(db, { ...card, verificationCode: "BBBBBBBBBB" }, null),
    ).rejects.toBeInstanceOf(StaleWriteError);
  });
});
