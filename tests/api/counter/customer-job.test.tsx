import { isValidElement, type ReactElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it } from "vitest";
import BobweightsPage from "@/app/(shop)/jobs/[id]/bobweights/page";
import JobOverviewPage from "@/app/(shop)/jobs/[id]/page";
import PlanPage from "@/app/(shop)/jobs/[id]/plan/page";
import RotatingPage from "@/app/(shop)/jobs/[id]/rotating/page";
import WeighPage from "@/app/(shop)/jobs/[id]/weigh/page";
import { GET as planCsv } from "@/app/api/jobs/[id]/plan/csv/route";
import { GET as weightsCsv } from "@/app/api/jobs/[id]/weights/csv/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import { CustomerJob } from "@/components/customer/customer-job";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { saveRotatingRecord } from "@/lib/workshop/save-rotating-record";
import { createWeighedJob } from "../cards/fixtures";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

// An invented cross-plane V8 with every part of a kind the same weight (g), so the bobweight can
// be worked by hand. Common practice for a cross-plane V8: two rods per crankpin, 50 % of the
// reciprocating mass. Per crankpin:
//   rotating       2 × (big end 450 + bearing 40)                                =  980
//   reciprocating  2 × (piston 500 + pin 120 + rings 40 + retainers 2 + small end 150)
//                  = 2 × 812 = 1624, at 50 %                                       =  812
//   oil allowance  4 per crankpin                                                  =    4
//   bobweight                                                                       = 1796 g
// shown one decimal finer than the 0.1 g scale: 1796.00 g.
const SAME = (g: string) => Array.from({ length: 8 }, () => g);
const V8 = {
  piston: SAME("500.0"),
  wristPin: SAME("120.0"),
  rings: SAME("40.0"),
  retainers: SAME("2.0"),
  smallEnd: SAME("150.0"),
  bigEnd: SAME("450.0"),
  bearing: SAME("40.0"),
};

// ISO 21940-11: e_per = G / ω; G 2.5 mm/s at 6000 rpm (ω = 2π·6000/60 = 628.3 rad/s) gives
// 2.5 × 1000 / 628.3 = 3.979 g·mm/kg; a 20 kg crank: U_per = 79.6 g·mm, 39.8 g·mm per plane
// (planes either side of the centre of mass, half each). Read at 100 mm: 0.398 g per plane.
// After 0.3 g in each plane (30 g·mm): within. After 0.5 g (50 g·mm): not within.
async function crankAfter(mass: string) {
  await saveRotatingRecord(
    db,
    {
      jobId: job.id,
      part: "crankshaft",
      baseVersion: 0,
      data: {
        massKg: "20",
        rpm: 6000,
        grade: "G 2.5",
        radiusMm: "100",
        after: { A: { mass }, B: { mass } },
      },
    },
    null,
  );
}

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createWeighedJob(
    db,
    users.customer.customerId!,
    {
      layout: "v8-cross-plane",
      cylinders: 8,
      oilAllowance: "4",
      scaleResolution: "0.1",
      promisedDate: "2026-12-18",
    },
    V8,
  );
});

async function customerPage(): Promise<ReactElement<Parameters<typeof CustomerJob>[0]>> {
  signInAs(users.customer);
  const element = await JobOverviewPage({ params: Promise.resolve({ id: String(job.id) }) });
  expect(isValidElement(element)).toBe(true);
  expect((element as ReactElement).type).toBe(CustomerJob);
  return element as ReactElement<Parameters<typeof CustomerJob>[0]>;
}

describe("a customer's own job page", () => {
  it("says in plain words what was done: parts weighed, the bobweight figure, the crank against its grade", async () => {
    await crankAfter("0.3");
    const page = await customerPage();
    expect(page.props.workDone).toEqual([
      "Weighed: 8 pistons, 8 wrist pins, 8 pairs of pin retainers, 8 ring sets, 8 small ends, 8 big ends and 8 sets of rod bearing shells.",
      "Bobweight for the crankshaft balance: 1796.00\u00a0g, the same on crankpins 1, 2, 3 and 4.",
      "Crankshaft balanced and checked within ISO balance grade G 2.5.",
    ]);
    const html = renderToStaticMarkup(<CustomerJob {...page.props} cards={null} />);
    expect(html).toContain("Where your job stands");
    expect(html).toContain("2026-12-18");
    // None of the bench's working reaches the customer.
    expect(html).not.toMatch(/Metal to remove|Scale|removal plan|readings/i);
    expect(html).toContain(`href="/jobs/${job.id}/billing"`);
  });

  it("a crank read outside its grade is not reported as within it", async () => {
    await crankAfter("0.5");
    const page = await customerPage();
    expect(page.props.workDone).toContain(
      "Crankshaft checked against ISO balance grade G 2.5: not yet within it.",
    );
  });

  it("shop staff keep the full overview", async () => {
    signInAs(users.counter);
    const element = await JobOverviewPage({ params: Promise.resolve({ id: String(job.id) }) });
    expect((element as ReactElement).type).not.toBe(CustomerJob);
  });
});

describe("the bench screens are the shop's", () => {
  it.each([
    ["weigh", WeighPage],
    ["plan", PlanPage],
    ["bobweights", BobweightsPage],
    ["rotating", RotatingPage],
  ] as const)("a customer opening /jobs/:id/%s gets the not-found page", async (_name, Page) => {
    signInAs(users.customer);
    const error = await Page({ params: Promise.resolve({ id: String(job.id) }) }).catch(
      (e: unknown) => e,
    );
    expect(String((error as { digest?: string }).digest)).toMatch(/NEXT_HTTP_ERROR_FALLBACK;404/);
  });

  it.each([
    ["workshop", getWorkshop],
    ["weights CSV", weightsCsv],
    ["plan CSV", planCsv],
  ] as const)(
    "a customer asking for their own job's %s is refused (403)",
    async (_name, handler) => {
      signInAs(users.customer);
      const res = await handler(new Request("http://localhost/x"), params({ id: String(job.id) }));
      expect(res.status).toBe(403);
      signInAs(users.machinist);
      const ok = await handler(new Request("http://localhost/x"), params({ id: String(job.id) }));
      expect(ok.status).toBe(200);
    },
  );
});
