import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it } from "vitest";
import { VerifiedCardView } from "@/components/cards/verified-card-view";
import type { DB } from "@/db/client";
import { findCardPdf } from "@/db/cards";
import { updateCounterSettings } from "@/lib/settings/counter-settings";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { showDate } from "@/lib/cards/format";
import { issueCard } from "@/lib/cards/issue";
import { verifyCardCode } from "@/lib/cards/verify";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { createFourCylinderJob, readPdf } from "./fixtures";

// A UTC evening west of Greenwich: 01:30 UTC on 3 Dec 2026 is 18:30 on 2 Dec in Denver
// (Mountain Standard Time, UTC−7, worked by hand: 01:30 − 7 h = 18:30 the day before).
const EVENING = "2026-12-03T01:30:00.000Z";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createFourCylinderJob(db, users.customer.customerId!);
  await updateCounterSettings(
    db,
    0,
    { senderName: null, replyTo: null, signature: null, mailOff: [], timeZone: "America/Denver" },
    null,
  );
});

describe("the balance card's date", () => {
  it("states the day on the shop's calendar, stored with the card", async () => {
    const card = await issueCard(db, job.id, users.machinist, { now: new Date(EVENING) });
    const row = await db
      .selectFrom("balance_cards")
      .select("data_json")
      .where("job_id", "=", job.id)
      .executeTakeFirstOrThrow();
    expect(JSON.parse(row.data_json)).toMatchObject({
      issuedAt: EVENING,
      timeZone: "America/Denver",
    });
    const pdf = await findCardPdf(db, job.id, card.revision);
    const { text } = await readPdf(pdf!);
    expect(text).toContain("Issued 2 Dec 2026");
    expect(text).not.toContain("Issued 3 Dec 2026");
  });

  it("keeps a card issued before the zone was stored reading in UTC", () => {
    expect(showDate(EVENING)).toBe("3 Dec 2026");
    expect(showDate(EVENING, "America/Denver")).toBe("2 Dec 2026");
  });
});

describe("the public check of a balance card", () => {
  it("gives the day the card states, on the issuing shop's calendar", async () => {
    const card = await issueCard(db, job.id, users.machinist, { now: new Date(EVENING) });
    const verified = await verifyCardCode(db, card.verificationCode);
    expect(verified.timeZone).toBe("America/Denver");
    const html = renderToStaticMarkup(createElement(VerifiedCardView, { card: verified }));
    expect(html).toContain("2 December 2026");
    expect(html).not.toContain("3 December 2026");
  });
});
