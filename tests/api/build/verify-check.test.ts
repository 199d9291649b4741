import { beforeEach, describe, expect, it } from "vitest";
import { GET as getPdf } from "@/app/api/jobs/[id]/build/cards/[revision]/pdf/route";
import { POST as issueCard } from "@/app/api/jobs/[id]/build/cards/route";
import { PUT as putSection } from "@/app/api/jobs/[id]/build/[section]/route";
import { POST as postCheck } from "@/app/api/verify/check/route";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { formatCode } from "@/lib/cards/code";
import { findCodesInPdf, MAX_CODES_PER_CHECK } from "@/lib/cards/verify";
import { setUpBuildJob } from "./fixtures";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

// The public "check a PDF" reads an issued engine build record as it reads a balance card: the
// very file issued is genuine (by its SHA-256), a file naming its code but differing is altered,
// and a revision since replaced says so. The files here are the PDFs the app itself issued.

let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  ({ users, job } = await setUpBuildJob());
  signInAs(users.machinist);
  const tdc = { firstStop: "-18", secondStop: "22" };
  const res = await putSection(
    jsonRequest("PUT", "/x", { version: 0, data: tdc }),
    params({ id: String(job.id), section: "tdc" }),
  );
  expect(res.status).toBe(200);
});

type Issued = { revision: number; verificationCode: string; bytes: Buffer };

async function issue(): Promise<Issued> {
  signInAs(users.machinist);
  const res = await issueCard(jsonRequest("POST", "/x"), params({ id: String(job.id) }));
  expect(res.status).toBe(201);
  const { card } = (await res.json()) as { card: Omit<Issued, "bytes"> };
  const pdf = await getPdf(
    jsonRequest("GET", "/x"),
    params({ id: String(job.id), revision: String(card.revision) }),
  );
  return { ...card, bytes: Buffer.from(await pdf.arrayBuffer()) };
}

async function check(bytes: Uint8Array) {
  signInAs(null);
  const form = new FormData();
  form.set("file", new File([Buffer.from(bytes)], "record.pdf", { type: "application/pdf" }));
  const res = await postCheck(
    new Request("http://localhost/api/verify/check", { method: "POST", body: form }),
    params({}),
  );
  expect(res.status).toBe(200);
  return (await res.json()) as Record<string, unknown>;
}

/** The same file with one byte flipped halfway through, away from where its code is written. */
function flipOneByte(bytes: Buffer): Buffer {
  const copy = Buffer.from(bytes);
  const middle = Math.floor(copy.length / 2);
  const mark = copy.indexOf("counterpoise-build-record");
  expect(Math.abs(mark - middle)).toBeGreaterThan(200);
  copy[middle] = copy[middle]! ^ 0xff;
  return copy;
}

describe("checking an engine build record PDF", () => {
  it("the issued file is genuine: build record revision 1 of the job, the current one", async () => {
    const first = await issue();
    expect(findCodesInPdf(first.bytes)).toEqual([first.verificationCode]);
    expect(await check(first.bytes)).toMatchObject({
      result: "genuine",
      buildRecord: {
        verificationCode: formatCode(first.verificationCode),
        revision: 1,
        jobNumber: job.number,
        status: "current",
      },
    });
  });

  it("a file naming its code but one byte different is altered, and the record on file is shown", async () => {
    const first = await issue();
    const answer = await check(flipOneByte(first.bytes));
    expect(answer).toMatchObject({
      result: "altered",
      buildRecord: { verificationCode: formatCode(first.verificationCode), revision: 1 },
    });
    expect(answer).not.toHaveProperty("card");
  });

  it("an older revision is still genuine but says it was replaced", async () => {
    const first = await issue();
    await issue();
    expect(await check(first.bytes)).toMatchObject({
      result: "genuine",
      buildRecord: { revision: 1, status: "superseded", latestRevision: 2 },
    });
  });

  it("is still found as the last of the most codes one check reads (200)", async () => {
    const first = await issue();
    const never = Array.from(
      { length: MAX_CODES_PER_CHECK - 1 },
      (_, i) => `counterpoise-build-record ${String(i).padStart(10, "0")}`,
    ).join("\n");
    const file = `%PDF-1.4\n% ${never}\n% counterpoise-build-record ${first.verificationCode}\n%%EOF\n`;
    expect(await check(new TextEncoder().encode(file))).toMatchObject({
      result: "altered",
      buildRecord: { revision: 1 },
    });
  });

  it("a PDF naming no issued code is not one of ours", async () => {
    const file = "%PDF-1.4\n% counterpoise-build-record 0000000000\n%%EOF\n";
    expect(await check(new TextEncoder().encode(file))).toEqual({
      result: "unknown",
      sha256: expect.any(String),
    });
  });
});
