import { renderToStaticMarkup } from "react-dom/server";
import { createElement } from "react";
import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putSection } from "@/app/api/jobs/[id]/build/[section]/route";
import { POST as issueCard } from "@/app/api/jobs/[id]/build/cards/route";
import { PATCH as patchRequest } from "@/app/api/jobs/[id]/build/requests/[requestId]/route";
import { POST as addRequest } from "@/app/api/jobs/[id]/build/requests/route";
import { describeChange } from "@/components/jobs/change-sentences";
import { JobChanges } from "@/components/jobs/job-changes";
import { type JobChange, listJobChanges } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { emptySection } from "@/lib/build-record/schemas";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { setUpBuildJob } from "./fixtures";

// The job's change list says what happened to its build record in plain sentences: figures as
// they were typed, in the record's unit, never JSON or a raw action name.

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  ({ db, users, job } = await setUpBuildJob());
  signInAs(users.machinist);
});

const id = () => ({ id: String(job.id) });

async function put(section: string, data: unknown, version: number) {
  const res = await putSection(
    jsonRequest("PUT", "/x", { version, data }),
    params({ ...id(), section }),
  );
  expect(res.status).toBe(200);
}

/** The job's history as the job page shows it, newest first, one line per entry. */
async function history(): Promise<string[]> {
  const changes = await listJobChanges(db, job.id);
  return changes.map((c) => describeChange(c, "g").join("; ")).filter((l) => l !== "");
}

describe("the build record in the job's change list", () => {
  it("a ring re-measured reads as its gap before and after, as typed, in mm", async () => {
    const specs = { ...emptySection("specs", "mm"), bore: "92.00" };
    await put("specs", specs, 0);
    const ring = { cylinder: 3, ring: "top", done: false };
    await put("rings", { rows: [{ ...ring, readings: ["0.46"] }] }, 0);
    await put("rings", { rows: [{ ...ring, readings: ["0.46", "0.50"] }] }, 1);
    const lines = await history();
    expect(lines[0]).toBe("Ring gaps saved: cylinder 3 top ring 0.46 → 0.50 mm");
    expect(lines[1]).toBe("Ring gaps saved: cylinder 3 top ring 0.46 mm");
    expect(lines[2]).toContain("Engine figures saved: lengths in mm; spring loads in N;");
    expect(lines[2]).toContain("finished bore 92.00 mm");
    // Saving again what is already saved is not news.
    await put("rings", { rows: [{ ...ring, readings: ["0.46", "0.50"] }] }, 2);
    expect((await history())[0]).toBe(lines[0]);
  });

  it("names a ring ticked done, a TDC stop and a spring load with their units", async () => {
    // A ring ticked done once its gap is in the window (0.0045 × 4.030 = 0.0181 in, common
    // practice); the gap as typed, in inches, the record's unit.
    const specs = {
      ...emptySection("specs", "in"),
      bore: "4.030",
      ringFactors: { top: "0.0045", second: null, oil: null },
    };
    await put("specs", specs, 0);
    const ring = { cylinder: 2, ring: "top", readings: ["0.019"] };
    await put("rings", { rows: [{ ...ring, done: false }] }, 0);
    await put("rings", { rows: [{ ...ring, done: true }] }, 1);
    expect((await history()).slice(0, 2)).toEqual([
      "Ring gaps saved: cylinder 2 top ring ticked done",
      "Ring gaps saved: cylinder 2 top ring 0.019 in",
    ]);
    await put("tdc", { firstStop: "-18", secondStop: "22" }, 0);
    await put("tdc", { firstStop: "-18.5", secondStop: "22" }, 1);
    expect((await history())[0]).toBe("True TDC saved: first stop -18 → -18.5°");
    const row = { cylinder: 1, valve: "intake", installedHeight: "1.800", shim: null };
    await put("springs", { rows: [{ ...row, seatLoad: "105" }] }, 0);
    expect((await history())[0]).toBe(
      "Valve springs saved: cylinder 1 intake spring installed height 1.800 in; cylinder 1 intake spring load 105 lb",
    );
  });

  it("a request written down, ticked done, then explained", async () => {
    signInAs(users.counter);
    const added = await addRequest(
      jsonRequest("POST", "/x", { text: "Fit the supplied vernier gear" }),
      params(id()),
    );
    const { request } = (await added.json()) as { request: { id: number; version: number } };
    signInAs(users.machinist);
    const tick = (body: object) =>
      patchRequest(
        jsonRequest("PATCH", "/x", body),
        params({ ...id(), requestId: String(request.id) }),
      );
    expect((await tick({ version: 1, state: "done", note: "" })).status).toBe(200);
    expect(
      (await tick({ version: 2, state: "explained", note: "Gear cracked at a tooth" })).status,
    ).toBe(200);
    expect((await history()).slice(0, 3)).toEqual([
      "Request “Fit the supplied vernier gear” not done: Gear cracked at a tooth",
      "Request “Fit the supplied vernier gear” ticked done",
      "Request “Fit the supplied vernier gear” written down",
    ]);
  });

  it("a revision issued, and shown on the job page's list", async () => {
    await put("tdc", { firstStop: "-18", secondStop: "22" }, 0);
    expect((await issueCard(jsonRequest("POST", "/x"), params(id()))).status).toBe(201);
    expect((await history())[0]).toBe("Build record revision 1 issued");
    const html = renderToStaticMarkup(
      createElement(JobChanges, {
        changes: await listJobChanges(db, job.id),
        unit: "g",
        timeZone: "UTC",
      }),
    );
    expect(html).toContain("Build record revision 1 issued.");
    expect(html).toContain("True TDC saved: first stop -18°; second stop 22°.");
  });

  it("an e-mailed revision names where it went; a failed one says it was not sent", () => {
    // The entry as sendBuildCard (lib/build-record/card.ts) writes it on the job.
    const entry = (action: string, status: string): JobChange => ({
      id: 1,
      at: "2026-12-02T08:00:00.000Z",
      who: "Machinist",
      action,
      entity: "job",
      subject: null,
      before: null,
      after: { revision: 2, to: "owner@example.test", status },
    });
    expect(describeChange(entry("email-build-record", "sent"), "g")).toEqual([
      "Build record revision 2 e-mailed to owner@example.test",
    ]);
    expect(describeChange(entry("email-build-record-failed", "failed"), "g")).toEqual([
      "Build record revision 2 e-mail to owner@example.test not sent (failed)",
    ]);
  });
});
