import { vi } from "vitest";
import { testSession } from "./session";

// Route handlers, pages and actions read the signed-in user through one function; tests decide who.
vi.mock("@/lib/auth/session", () => ({ readSessionUserId: async () => testSession.userId }));
// Cache revalidation needs a running Next server; here it is a no-op.
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));
