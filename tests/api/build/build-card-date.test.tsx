import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putSection } from "@/app/api/jobs/[id]/build/[section]/route";
import { GET as getPdf } from "@/app/api/jobs/[id]/build/cards/[revision]/pdf/route";
import { VerifiedBuildCardView } from "@/components/build/verified-build-card";
import type { DB } from "@/db/client";
import { updateCounterSettings } from "@/lib/settings/counter-settings";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { issueBuildCard, verifyBuildCardCode } from "@/lib/build-record/card";
import { emptySection } from "@/lib/build-record/schemas";
import { readPdf } from "../cards/fixtures";
import { setUpBuildJob } from "./fixtures";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

// A UTC evening west of Greenwich: 01:30 UTC on 3 Dec 2026 is 18:30 on 2 Dec in Denver
// (Mountain Standard Time, UTC−7, worked by hand: 01:30 − 7 h = 18:30 the day before).
const EVENING = new Date("2026-12-03T01:30:00.000Z");

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  ({ db, users, job } = await setUpBuildJob());
  await updateCounterSettings(
    db,
    0,
    { senderName: null, replyTo: null, signature: null, mailOff: [], timeZone: "America/Denver" },
    null,
  );
  signInAs(users.machinist);
  await putSection(
    jsonRequest("PUT", "/x", {
      version: 0,
      data: { ...emptySection("specs", "in"), bore: "4.030" },
    }),
    params({ id: String(job.id), section: "specs" }),
  );
});

describe("the engine build record's date", () => {
  it("is the day on the shop's calendar, on the PDF and on the public check", async () => {
    const card = await issueBuildCard(db, job, users.machinist, EVENING);
    const res = await getPdf(
      jsonRequest("GET", "/x"),
      params({ id: String(job.id), revision: "1" }),
    );
    const { text } = await readPdf(Buffer.from(await res.arrayBuffer()));
    expect(text).toContain("issued 2026-12-02");
    expect(text).not.toContain("2026-12-03");
    const verified = await verifyBuildCardCode(db, card.verificationCode);
    expect(verified?.timeZone).toBe("America/Denver");
    const html = renderToStaticMarkup(<VerifiedBuildCardView card={verified!} />);
    expect(html).toContain("issued 2026-12-02");
  });

  it("keeps a record issued before the zone was stored reading in UTC", async () => {
    const card = await issueBuildCard(db, job, users.machinist, EVENING);
    // A record issued before the zone was kept with it: its stored data has no timeZone.
    const row = await db
      .selectFrom("build_cards")
      .select(["id", "data_json"])
      .executeTakeFirstOrThrow();
    const { timeZone: _dropped, ...before } = JSON.parse(row.data_json) as Record<string, unknown>;
    expect(_dropped).toBe("America/Denver");
    await db
      .updateTable("build_cards")
      .set({ data_json: JSON.stringify(before) })
      .where("id", "=", row.id)
      .execute();
    const older = await verifyBuildCardCode(db, card.verificationCode);
    expect(older?.timeZone).toBe("UTC");
    expect(renderToStaticMarkup(<VerifiedBuildCardView card={older!} />)).toContain(
      "issued 2026-12-03",
    );
  });
});
