import { BUILD_CARD_CAUTIONS } from "@/lib/build-record/card-lines";
import type { VerifiedBuildCard } from "@/lib/build-record/card";
import { shopDate } from "@/lib/dates/shop-time";

/**
 * The public check of an issued engine build record: its figures as issued, no customer. Its
 * title is the page's heading on /verify/<code>, one level down inside the file check.
 */
export function VerifiedBuildCardView({
  card,
  headingLevel = 1,
}: {
  card: VerifiedBuildCard;
  headingLevel?: 1 | 2;
}) {
  const Title = headingLevel === 1 ? "h1" : "h2";
  const Sub = headingLevel === 1 ? "h2" : "h3";
  return (
    <>
      <Title className="text-2xl font-semibold">Engine build record {card.verificationCode}</Title>
      <p className="text-sm" data-testid="build-card-status">
        {card.shopName} · job <span className="font-mono">{card.jobNumber}</span> · {card.engine} ·
        revision {card.revision}, issued {shopDate(new Date(card.issuedAt), card.timeZone)} ·{" "}
        {card.status === "current" ? (
          <span className="font-semibold text-within">the current record</span>
        ) : (
          <span className="font-semibold text-replace">
            replaced by revision {card.latestRevision}
          </span>
        )}
      </p>
      {card.tables.map((t) => (
        <section key={t.title} className="panel overflow-x-auto p-4">
          <Sub className="mb-1 font-semibold">{t.title}</Sub>
          {t.note ? <p className="mb-1 text-sm text-graphite-600">{t.note}</p> : null}
          <table className="text-sm">
            <thead>
              <tr className="text-left text-graphite-500">
                {t.head.map((h) => (
                  <th key={h} className="pr-4 font-semibold">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {t.rows.map((row, i) => (
                <tr key={i}>
                  {row.map((cell, j) => (
                    <td key={j} className="pr-4 font-mono">
                      {cell}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ))}
      <p className="text-xs text-graphite-500">
        SHA-256 of the PDF as issued: <span className="font-mono break-all">{card.sha256}</span>
      </p>
      <aside className="border-l-4 border-machine pl-3 text-sm text-graphite-700">
        <Sub className="mb-1 font-semibold">Cautions</Sub>
        <ul className="space-y-1">
          {BUILD_CARD_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </aside>
    </>
  );
}
