/** Who the mocked session says is signed in (null: nobody). */
export const testSession: { userId: number | null } = { userId: null };

export function signInAs(user: { id: number } | null): void {
  testSession.userId = user?.id ?? null;
}
