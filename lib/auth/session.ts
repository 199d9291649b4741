import { getServerSession } from "next-auth";
import { authOptions } from "./options";

/** The user id carried by the signed session cookie of the current request, if any. */
export async function readSessionUserId(): Promise<number | null> {
  const session = await getServerSession(authOptions());
  const id = session?.user?.id;
  return typeof id === "number" && Number.isInteger(id) ? id : null;
}
