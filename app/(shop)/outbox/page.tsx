import { MailStatusBadge } from "@/components/mail/mail-status";
import { RetryMailButton } from "@/components/mail/retry-mail-button";
import { formatFileSize } from "@/components/uploads/format";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { requirePagePermission } from "@/lib/auth/guard";
import { shopDateTime } from "@/lib/dates/shop-time";
import { readOutbox } from "@/lib/mail/outbox";

export const metadata = { title: "Mail outbox" };

export default async function OutboxPage() {
  await requirePagePermission("manage-mail", "/outbox");
  const [{ log }, { timeZone }] = await Promise.all([
    readOutbox(getDb()),
    findCounterSettings(getDb()),
  ]);
  // Times on the shop's clock, with the zone named (counter settings).
  const when = (iso: string | null) => (iso ? shopDateTime(iso, timeZone) : "—");

  return (
    <section className="space-y-6">
      <h1 className="text-2xl font-semibold">Mail outbox</h1>

      <div className="space-y-2">
        <h2 className="text-lg font-semibold">Every message sent or attempted</h2>
        <div className="panel overflow-x-auto">
          <table className="w-full text-left text-sm" data-testid="mail-log">
            <thead className="border-b border-graphite-200 bg-graphite-50 text-graphite-600">
              <tr>
                <th className="px-3 py-2 font-semibold">When</th>
                <th className="px-3 py-2 font-semibold">For</th>
                <th className="px-3 py-2 font-semibold">To</th>
                <th className="px-3 py-2 font-semibold">Subject</th>
                <th className="px-3 py-2 font-semibold">Status</th>
                <th className="px-3 py-2 font-semibold">Server said</th>
                <th className="px-3 py-2" />
              </tr>
            </thead>
            <tbody>
              {log.map((m) => (
                <tr key={m.id} className="border-b border-graphite-100 align-top last:border-0">
                  <td className="px-3 py-2 font-mono whitespace-nowrap">
                    {when(m.sentAt ?? m.updatedAt)}
                  </td>
                  <td className="px-3 py-2">{m.kind}</td>
                  <td className="px-3 py-2">{m.to}</td>
                  <td className="px-3 py-2">
                    {m.subject}
                    {m.attachments.map((a) => (
                      <span key={a.filename} className="block text-xs text-graphite-500">
                        {a.filename} · {formatFileSize(a.sizeBytes)}
                      </span>
                    ))}
                  </td>
                  <td className="px-3 py-2">
                    <MailStatusBadge status={m.status} />
                    {m.attempts > 1 ? (
                      <span className="block text-xs text-graphite-500">{m.attempts} attempts</span>
                    ) : null}
                  </td>
                  <td className="max-w-xs px-3 py-2 text-xs break-words text-graphite-600">
                    {m.status === "failed" ? (
                      <span className="text-replace">{m.lastError}</span>
                    ) : (
                      m.serverResponse
                    )}
                  </td>
                  <td className="px-3 py-2">
                    {m.status === "failed" && !m.bodyRemoved ? (
                      <RetryMailButton mailId={m.id} />
                    ) : null}
                  </td>
                </tr>
              ))}
              {log.length === 0 ? (
                <tr>
                  <td colSpan={7} className="px-3 py-8 text-center text-graphite-500">
                    No mail yet.
                  </td>
                </tr>
              ) : null}
            </tbody>
          </table>
        </div>
      </div>

      <div className="space-y-2">
        <h2 className="text-lg font-semibold">The messages</h2>
        <p className="text-sm text-graphite-600">
          As the mail log keeps them, newest first. A message holding a one-time sign-in link keeps
          its text only until it has been sent.
        </p>
        {log.length === 0 ? (
          <p className="panel p-4 text-sm text-graphite-500">Nothing sent yet.</p>
        ) : (
          <ul className="space-y-2" data-testid="mail-messages">
            {log.map((m) => (
              <li key={m.id} className="panel">
                <details>
                  <summary className="cursor-pointer p-3 text-sm">
                    <span className="font-mono text-graphite-500">
                      {when(m.sentAt ?? m.updatedAt)}
                    </span>{" "}
                    <span className="font-semibold">{m.subject || "(no subject)"}</span> → {m.to}
                    {m.attachments.length > 0 ? (
                      <span className="text-graphite-500">
                        {" "}
                        · {m.attachments.length} attachment{m.attachments.length === 1 ? "" : "s"}
                      </span>
                    ) : null}
                  </summary>
                  <div className="space-y-2 border-t border-graphite-100 p-3 text-sm">
                    <p className="text-graphite-600">
                      From {m.from ?? "— (not tried yet)"}
                      {m.replyTo ? ` · replies to ${m.replyTo}` : ""}
                    </p>
                    <pre className="font-mono text-xs whitespace-pre-wrap">{m.text}</pre>
                    {m.html ? (
                      <p className="text-xs text-graphite-500">Also sent as HTML.</p>
                    ) : null}
                  </div>
                </details>
              </li>
            ))}
          </ul>
        )}
      </div>
    </section>
  );
}
