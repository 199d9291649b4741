import type { ReactNode } from "react";
import type { VerifiedCard } from "@/lib/cards/verify";
import { CARD_CAUTIONS, NO_BOBWEIGHT_TEXT } from "@/lib/cards/wording";

/** The day as the card states it: on the issuing shop's calendar (UTC for older cards). */
const day = (iso: string, timeZone: string) =>
  new Intl.DateTimeFormat("en-GB", {
    day: "numeric",
    month: "long",
    year: "numeric",
    timeZone,
  }).format(new Date(iso));
const grade = (g: string) => `G ${g.replace(/^G\s?/i, "")}`;

/** The key figures of a card as our records hold them, and whether it is still the current one. */
export function VerifiedCardView({ card }: { card: VerifiedCard }) {
  return (
    <article className="space-y-4" data-testid="verified-card">
      {card.status === "current" ? (
        <p
          className="rounded border border-within/40 bg-within/10 p-3 font-semibold text-within"
          role="status"
        >
          Issued by {card.shopName}: revision {card.revision} is the current balance card for job{" "}
          {card.jobNumber}.
        </p>
      ) : (
        <p
          className="rounded border border-machine/40 bg-machine/10 p-3 font-semibold text-machine"
          role="status"
        >
          Issued by {card.shopName}, but replaced: revision {card.supersededByRevision} is the
          current card for job {card.jobNumber}
          {card.supersededAt ? ` (since ${day(card.supersededAt, card.timeZone)})` : ""}. Ask the
          shop for it.
        </p>
      )}
      <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-3">
        <Fact term="Shop">{card.shopName}</Fact>
        <Fact term="Job">
          <span className="font-mono">{card.jobNumber}</span>
        </Fact>
        <Fact term="Engine">{card.engine}</Fact>
        <Fact term="Issued">{day(card.issuedAt, card.timeZone)}</Fact>
        <Fact term="Revision">{card.revision}</Fact>
        <Fact term="Verification code">
          <span className="font-mono">{card.verificationCode}</span>
        </Fact>
        {/* Named on the card, as its first caution says: the scale resolution and the balancer. */}
        <Fact term="Scale">
          {card.equipment.scaleName ?? "Shop scale"}, resolution{" "}
          <span className="font-mono">{`${card.equipment.resolution}\u00a0${card.bobweights.unit}`}</span>
        </Fact>
        <Fact term="Balancer">{card.equipment.balancerName ?? "Not named on the card"}</Fact>
      </dl>
      <section>
        <h2 className="mb-1 text-sm font-semibold text-graphite-600">Bobweights</h2>
        {card.bobweights.needed ? (
          <table className="text-sm">
            <thead className="text-left text-graphite-600">
              <tr>
                <th className="pr-6 font-semibold">Crankpin</th>
                <th className="pr-6 font-semibold">Cylinders</th>
                <th className="text-right font-semibold">Bobweight, {card.bobweights.unit}</th>
              </tr>
            </thead>
            <tbody>
              {card.bobweights.perPin.map((b) => (
                <tr key={b.crankpin}>
                  <td className="pr-6 font-mono">{b.crankpin}</td>
                  <td className="pr-6">{b.cylinders.join(" & ")}</td>
                  <td className="text-right font-mono">{b.printed}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : (
          <p>{NO_BOBWEIGHT_TEXT}.</p>
        )}
      </section>
      <section>
        <h2 className="mb-1 text-sm font-semibold text-graphite-600">Crankshaft</h2>
        {!card.crank || !card.crank.grade ? (
          <p>No crankshaft balance was recorded on this card.</p>
        ) : card.crank.pass === null ? (
          <p>Balance grade {grade(card.crank.grade)}; the final reading was not recorded.</p>
        ) : card.crank.pass ? (
          <p className="font-semibold text-within">
            Within {grade(card.crank.grade)} (ISO 21940-11).
          </p>
        ) : (
          <p className="font-semibold text-replace">
            Outside {grade(card.crank.grade)} (ISO 21940-11).
          </p>
        )}
      </section>
      <p className="break-all text-xs text-graphite-500">
        SHA-256 of the PDF as issued: <span className="font-mono">{card.sha256}</span>
      </p>
    </article>
  );
}

function Fact({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-xs font-semibold tracking-wide text-graphite-500 uppercase">{term}</dt>
      <dd>{children}</dd>
    </div>
  );
}

export function CardCautions() {
  return (
    <aside className="border-l-4 border-machine pl-3 text-sm text-graphite-700">
      <h2 className="mb-1 font-semibold">Cautions</h2>
      <ul className="space-y-1">
        {CARD_CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </aside>
  );
}
