import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { POST as sendCard } from "@/app/api/jobs/[id]/cards/[revision]/send/route";
import { POST as postCard } from "@/app/api/jobs/[id]/cards/route";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import { listMailLog } from "@/db/mail";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { createFourCylinderJob } from "../cards/fixtures";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { MailHarness } from "../../lib/mail/fake-mail";

let db: DB;
let users: Record<Role, User>;
let job: Job;
const mail = new MailHarness();

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createFourCylinderJob(db, users.customer.customerId!);
  await mail.setUp();
  await mail.start();
});

afterEach(() => mail.tearDown());

async function issue() {
  signInAs(users.machinist);
  const res = await postCard(jsonRequest("POST", "/x"), params({ id: String(job.id) }));
  expect(res.status).toBe(201);
  return (await res.json()).card as { revision: number };
}

describe("a re-issued balance card reaches the customer who had the earlier one", () => {
  it("sends revision 2, attached, once revision 1 had been e-mailed", async () => {
    await issue();
    signInAs(users.counter);
    const sent = await sendCard(
      jsonRequest("POST", `/x`, {}),
      params({ id: String(job.id), revision: "1" }),
    );
    expect(sent.status).toBe(200);
    expect((await issue()).revision).toBe(2);

    const messages = await mail.captured();
    expect(messages).toHaveLength(2);
    // Revision 1, sent from the counter, goes out in the shop's template: text and HTML alike.
    const first = messages.find((m) => m.subject?.startsWith("Balance card"))!;
    expect(first.html).toContain(`Attached is the balance card for job ${job.number}`);
    expect(first.text).toContain("This is revision 1, the current card for the job.");
    const reissued = messages.find((m) => m.subject?.startsWith("Re-issued"))!;
    expect(reissued.subject).toBe(`Re-issued balance card for job ${job.number} (revision 2)`);
    expect(reissued.text).toContain("replaces the card we sent before");
    expect(reissued.attachments.map((a) => a.filename)).toEqual([
      `balance-card-${job.number}-r2.pdf`,
    ]);
    expect(reissued.attachments[0]!.content.subarray(0, 5).toString()).toBe("%PDF-");
    const log = await listMailLog(db, { jobId: job.id });
    expect(log.map((m) => [m.kind, m.status])).toContainEqual(["card-reissued", "sent"]);
  });

  it("sends nothing when no card had been e-mailed yet", async () => {
    await issue();
    await issue();
    expect(await mail.captured()).toHaveLength(0);
  });
});
