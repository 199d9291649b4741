import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it } from "vitest";
import { JobCards } from "@/components/cards/job-cards";
import type { DB } from "@/db/client";
import { createJob } from "@/lib/jobs/save";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { savePartTarget } from "@/lib/workshop/save-target";
import { issueCard } from "@/lib/cards/issue";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import {
  createFourCylinderJob,
  createWeighedJob,
  FOUR_CYL_WEIGHTS,
} from "../../api/cards/fixtures";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

// The panel reads the card list through TanStack Query, as the app's providers give it.
const html = async (jobId: number, user: User) =>
  renderToStaticMarkup(
    createElement(
      QueryClientProvider,
      { client: new QueryClient() },
      await JobCards({ jobId, user }),
    ),
  );

describe("the job page's balance card panel", () => {
  it("lists every revision, current and replaced, with downloads, for the machinist to issue the next", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    await issueCard(db, job.id, users.machinist);
    await issueCard(db, job.id, users.machinist);
    const page = await html(job.id, users.machinist);
    expect(page).toContain("Revision 2");
    expect(page).toContain("Current");
    expect(page).toContain("Replaced by revision 2");
    expect(page).toContain(`href="/api/jobs/${job.id}/cards/1/pdf"`);
    expect(page).toContain("Issue balance card (revision 3)");
    expect(page).toContain("E-mail to customer");
  });

  it("gives the counter e-mailing but no issuing, and the customer downloads only", async () => {
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    await issueCard(db, job.id, users.owner);
    const counter = await html(job.id, users.counter);
    expect(counter).toContain("E-mail to customer");
    expect(counter).not.toContain("Issue balance card");
    const customer = await html(job.id, users.customer);
    expect(customer).toContain("Download PDF");
    expect(customer).not.toContain("E-mail to customer");
    expect(customer).not.toContain("Issue balance card");
  });

  it("says why a card cannot be issued while the weigh-in is incomplete", async () => {
    const job = await createJob(
      db,
      {
        customerId: users.customer.customerId!,
        engine: "x",
        spec: { layout: "single", cylinders: 1 },
      },
      null,
    );
    const page = await html(job.id, users.machinist);
    expect(page).toContain("No balance card has been issued for this job yet.");
    expect(page).toContain("The weigh-in is not complete: 4 parts have no weight yet");
    expect(page).toMatch(/<button[^>]*disabled=""[^>]*>Issue balance card<\/button>/);
  });

  it("lists the parts a card would carry only with a reason, with the override to tick", async () => {
    // Pistons 400.0, 401.2, 400.3, 400.9 with a set target of 400.2: cylinder 1's 400.0 is light.
    const job = await createWeighedJob(
      db,
      users.customer.customerId!,
      { layout: "inline-4", cylinders: 4 },
      FOUR_CYL_WEIGHTS,
    );
    await savePartTarget(
      db,
      { jobId: job.id, kind: "piston", target: "400.2", baseVersion: 0 },
      null,
    );
    const page = await html(job.id, users.machinist);
    expect(page).toContain("cylinder 1 piston light (400.0 g against the target 400.20 g)");
    expect(page).toContain("Issue with these parts");
    expect(page).toContain("Reason (printed on the card)");
  });
});
