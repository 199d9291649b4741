import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it } from "vitest";
import { VerifiedCardView } from "@/components/cards/verified-card-view";
import type { DB } from "@/db/client";
import type { StoredCard } from "@/db/cards";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { issueCard } from "@/lib/cards/issue";
import { toVerifiedCard, verifyCardCode } from "@/lib/cards/verify";
import { CARD_CAUTIONS } from "@/lib/cards/wording";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { createFourCylinderJob } from "./fixtures";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

/** The page's text, tags dropped and the non-breaking space read as a space. */
const text = (html: string) =>
  html
    .replace(/<[^>]+>/g, " ")
    .replace(/&nbsp;|\u00a0/g, " ")
    .replace(/\s+/g, " ");

describe("the public check of a balance card names the scale and the balancer", () => {
  it("shows the scale, its resolution and the balancer the card was issued with", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    const card = await issueCard(db, job.id, users.machinist);
    const verified = await verifyCardCode(db, card.verificationCode);
    expect(verified.equipment).toEqual({
      scaleName: "Bench scale",
      resolution: "0.1",
      balancerName: "Test balancer",
    });
    const shown = text(renderToStaticMarkup(createElement(VerifiedCardView, { card: verified })));
    expect(shown).toContain("Bench scale, resolution 0.1 g");
    expect(shown).toContain("Balancer Test balancer");
  });

  it("says plainly where the shop named no scale or balancer (a card issued before they were kept)", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    const card = await issueCard(db, job.id, users.machinist);
    const stored = await db
      .selectFrom("balance_cards")
      .select("data_json")
      .where("job_id", "=", job.id)
      .executeTakeFirstOrThrow();
    const data = JSON.parse(stored.data_json) as Record<string, unknown>;
    delete data.scaleName;
    delete data.balancerName;
    const older = toVerifiedCard({
      ...(card as unknown as StoredCard),
      dataJson: JSON.stringify(data),
      supersededAt: null,
      supersededByRevision: null,
    });
    const shown = text(renderToStaticMarkup(createElement(VerifiedCardView, { card: older })));
    expect(shown).toContain("Shop scale, resolution 0.1 g");
    expect(shown).toContain("Not named on the card");
  });

  it("the caution claims only what the card and the check show", () => {
    expect(CARD_CAUTIONS[0]).toContain("the balancer used where the shop named it");
  });
});
