import { getServerSession } from "next-auth";
import { authOptions } from "./options";

/** What a signed session cookie claims: whose it is, which session, at which session version. */
export interface SessionClaim {
  userId: number;
  /** The session's own id (set at sign-in); null on a cookie issued before sessions had one. */
  sid: string | null;
  /** The user's session version when it was issued; 0 on a cookie issued before versions. */
  sessionVersion: number;
}

/** The claim of the signed session cookie of the current request, if any. */
export async function readSession(): Promise<SessionClaim | null> {
  const session = await getServerSession(authOptions());
  const user = session?.user;
  if (!user || typeof user.id !== "number" || !Number.isInteger(user.id)) return null;
  const id = user.id;
  return {
    userId: id,
    sid: typeof user.sid === "string" ? user.sid : null,
    sessionVersion: typeof user.sv === "number" ? user.sv : 0,
  };
}

/** The user id carried by the signed session cookie of the current request, if any. */
export async function readSessionUserId(): Promise<number | null> {
  return (await readSession())?.userId ?? null;
}
