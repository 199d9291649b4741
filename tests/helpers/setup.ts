import { vi } from "vitest";
import { testSession } from "./session";

// Route handlers, pages and actions read the signed-in user through one function; tests decide who.
vi.mock("@/lib/auth/session", () => ({
  readSessionUserId: async () => testSession.userId,
  readSession: async () => {
    const { userId, sid, sessionVersion } = testSession;
    if (userId === null) return null;
    if (sessionVersion !== "current") return { userId, sid, sessionVersion };
    const { getDb } = await import("@/db/client");
    const { findSessionVersion } = await import("@/db/users");
    return { userId, sid, sessionVersion: (await findSessionVersion(getDb(), userId)) ?? 0 };
  },
}));
// Cache revalidation needs a running Next server; here it is a no-op.
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));
