import type { ThrottleNotice } from "@/db/sign-in-failures";

import { shopDateTime } from "@/lib/dates/shop-time";

function describe(n: ThrottleNotice): string {
  const who = n.email ?? "several e-mails";
  const where = n.address ? ` from ${n.address}` : n.email ? " from several places" : "";
  return `${n.failures} failed sign-ins for ${who}${where}. Each further try now waits: 30 seconds at first, twice as long after every failure.`;
}

/**
 * The owner's notice that sign-in is being slowed: an e-mail (or a client address) had enough
 * failed tries that further tries now wait. A stranger guessing a password shows up here.
 */
export function SignInNotices({
  notices,
  timeZone,
}: {
  notices: ThrottleNotice[];
  /** The shop's time zone (IANA name): times on the shop's clock. */
  timeZone: string;
}) {
  if (notices.length === 0) return null;
  return (
    <div className="panel space-y-2 p-4" data-testid="sign-in-notices">
      <h2 className="text-lg font-semibold">Sign-in slowed (last 7 days)</h2>
      <ul className="space-y-1 text-sm">
        {notices.map((n) => (
          <li key={`${n.at}-${n.email}-${n.address}`}>
            <span className="font-mono text-graphite-600">{shopDateTime(n.at, timeZone)}</span>{" "}
            {describe(n)}
          </li>
        ))}
      </ul>
      <p className="text-sm text-graphite-600">
        If these were not your own people mistyping, someone may be guessing passwords: make sure
        everyone's password is long and not used elsewhere.
      </p>
    </div>
  );
}
