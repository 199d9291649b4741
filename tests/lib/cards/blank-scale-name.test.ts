import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { issueCard } from "@/lib/cards/issue";
import { findCardFile } from "@/lib/cards/list";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { createWeighedJob, FOUR_CYL_WEIGHTS, readPdf } from "../../api/cards/fixtures";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

// The job settings form saves a cleared "Scale used" / "Balancer used" box as an empty string.
// The card must then read as if no name was given, never ", resolution 0.1 g" with nothing before
// the comma nor an empty balancer box.
describe("a balance card for a job whose scale and balancer names were left blank", () => {
  it("names the scale and balancer in plain words instead of printing an empty name", async () => {
    const job = await createWeighedJob(
      db,
      users.customer.customerId!,
      { layout: "inline-4", cylinders: 4, scaleName: "", balancerName: "  " },
      FOUR_CYL_WEIGHTS,
    );
    const card = await issueCard(db, job.id, users.machinist, {});
    const file = await findCardFile(db, job.id, card.revision, users.owner);
    const text = (await readPdf(file.bytes)).text.replace(/\s+/g, " ");
    expect(text).not.toMatch(/(^|[^A-Za-z]) ?, resolution/);
    expect(text).toContain("Shop scale, resolution 0.1 g");
    expect(text).toContain("Not named");
  });
});
