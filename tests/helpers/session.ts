/**
 * Who the mocked session says is signed in (null: nobody). `sessionVersion` "current" stands for
 * a cookie just issued (the user's version in the database); a number for an older cookie.
 */
export const testSession: {
  userId: number | null;
  sid: string | null;
  sessionVersion: number | "current";
} = { userId: null, sid: null, sessionVersion: "current" };

export function signInAs(user: { id: number } | null): void {
  testSession.userId = user?.id ?? null;
  testSession.sid = null;
  testSession.sessionVersion = "current";
}
