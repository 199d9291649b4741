import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putSection } from "@/app/api/jobs/[id]/build/[section]/route";
import { GET as getHistory } from "@/app/api/jobs/[id]/history/route";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";
import { setUpBuildJob } from "./build/fixtures";

// The job's change list goes back to the first weigh-in however many build-record saves came
// after it: 100 entries a page, each page keyed by entry id ("before" the last one shown).

interface Page {
  changes: { id: number; action: string; entity: string; subject: string | null }[];
  earlier: number | null;
}

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  ({ db, users, job } = await setUpBuildJob());
  signInAs(users.machinist);
});

async function page(before?: number | string): Promise<Response> {
  const query = before === undefined ? "" : `?before=${before}`;
  return getHistory(
    jsonRequest("GET", `/api/jobs/${job.id}/history${query}`),
    params({ id: String(job.id) }),
  );
}

async function okPage(before?: number): Promise<Page> {
  const res = await page(before);
  expect(res.status).toBe(200);
  return (await res.json()) as Page;
}

/** One weigh-in, then `saves` saves of the true-TDC section of the build record. */
async function weighThenSave(saves: number) {
  const weighed = await putWeight(
    jsonRequest("PUT", "/x", {
      cylinder: 1,
      kind: "piston",
      phase: "initial",
      readings: ["512.4"],
      version: 0,
    }),
    params({ id: String(job.id) }),
  );
  expect(weighed.status).toBe(200);
  for (let version = 0; version < saves; version++) {
    const res = await putSection(
      jsonRequest("PUT", "/x", {
        version,
        data: { firstStop: String(-(version % 40) - 1), secondStop: "22" },
      }),
      params({ id: String(job.id), section: "tdc" }),
    );
    expect(res.status).toBe(200);
  }
}

describe("GET /api/jobs/:id/history", () => {
  it("pages back 100 at a time to the first weigh-in under 205 build-record saves", async () => {
    await weighThenSave(205);
    // Every entry of the job, counted straight from the audit table: the booking, the weigh-in
    // and the 205 saves (more if booking writes more than one).
    const all = await db
      .selectFrom("audit_log")
      .select("id")
      .where((eb) =>
        eb.or([
          eb.and([eb("entity", "=", "job"), eb("entity_id", "=", String(job.id))]),
          eb("entity_id", "like", `${job.id}:%`),
        ]),
      )
      .orderBy("id", "desc")
      .execute();
    expect(all.length).toBeGreaterThanOrEqual(207);

    const pages: Page[] = [await okPage()];
    while (pages.at(-1)!.earlier !== null) pages.push(await okPage(pages.at(-1)!.earlier!));
    // 207 or more entries at 100 a page: three pages, the first two full.
    expect(pages.length).toBe(Math.ceil(all.length / 100));
    expect(pages[0]!.changes).toHaveLength(100);
    expect(pages[1]!.changes).toHaveLength(100);
    // Each page's cursor is the last id it shows, and the next page starts right below it.
    expect(pages[0]!.earlier).toBe(pages[0]!.changes[99]!.id);
    const ids = pages.flatMap((p) => p.changes.map((c) => c.id));
    expect(ids).toEqual(all.map((r) => r.id)); // every entry once, newest first, none skipped
    const weighIn = pages.at(-1)!.changes.find((c) => c.entity === "part_weight");
    expect(weighIn?.subject).toBe("1:piston:initial");
  });

  it("a save made while the list is open does not shift the earlier pages", async () => {
    await weighThenSave(120);
    const first = await okPage();
    await putSection(
      jsonRequest("PUT", "/x", { version: 120, data: { firstStop: "-7", secondStop: "21" } }),
      params({ id: String(job.id), section: "tdc" }),
    );
    const second = await okPage(first.earlier!);
    expect(second.changes[0]!.id).toBeLessThan(first.changes.at(-1)!.id);
    expect(second.changes[0]!.id).toBe(first.changes.at(-1)!.id - 1);
  });

  it("refuses a cursor that is not an entry number, naming it", async () => {
    const res = await page("yesterday");
    expect(res.status).toBe(422);
    expect(Object.keys((await res.json()).error.fields)).toEqual(["before"]);
  });

  it("is the shop's: a customer is refused", async () => {
    signInAs(users.customer);
    expect((await page()).status).toBe(403);
  });
});
