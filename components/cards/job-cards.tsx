import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { findCustomerById } from "@/db/customers";
import type { User } from "@/db/users";
import { may } from "@/lib/auth/policy";
import { cardBlocker } from "@/lib/cards/blocker";
import { cardExceptions } from "@/lib/cards/exceptions";
import { listJobCards } from "@/lib/cards/list";
import { env } from "@/lib/env";
import { findJobForUser } from "@/lib/jobs/access";
import { loadWorkshop } from "@/lib/workshop/load";
import { CardsPanel } from "./cards-panel";

/**
 * The job's balance cards for the job page: every revision with its download, and for shop staff
 * issuing (machinist, owner) and e-mailing (owner, counter, machinist).
 */
export async function JobCards({ jobId, user }: { jobId: number; user: User }) {
  const db = getDb();
  const job = await findJobForUser(db, jobId, user);
  const canIssue = may(user, "issue-card");
  const canSend = may(user, "send-card");
  const [cards, workshop, customer, { timeZone }] = await Promise.all([
    listJobCards(db, job.id, user),
    canIssue ? loadWorkshop(db, job) : null,
    canSend ? findCustomerById(db, job.customerId) : null,
    findCounterSettings(db),
  ]);
  return (
    <section className="panel space-y-3 p-4" aria-labelledby={`cards-${job.id}`}>
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`cards-${job.id}`} className="text-lg font-semibold">
          Balance card
        </h2>
        <p className="text-xs text-graphite-500">
          Anyone holding a card can check it at /verify with the code printed on it.
        </p>
      </header>
      <CardsPanel
        jobId={job.id}
        initialCards={cards}
        canIssue={canIssue}
        canSend={canSend}
        blocker={workshop ? cardBlocker(workshop) : null}
        exceptions={workshop ? cardExceptions(workshop).map((e) => e.text) : []}
        customerEmail={customer?.email ?? null}
        defaultPageSize={env().CARD_PAGE_SIZE}
        timeZone={timeZone}
      />
      {canIssue ? (
        <p className="text-xs text-graphite-500">
          Check the figures against the engine maker&apos;s before issuing: the card supports, not
          replaces, the machinist&apos;s judgement.
        </p>
      ) : null}
    </section>
  );
}
