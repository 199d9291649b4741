import { redirect } from "next/navigation";
import { getDb } from "@/db/client";
import type { Role } from "@/db/schema";
import { findUserById, type User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";
import { readSessionUserId } from "./session";

export type Access = { ok: true; user: User } | { ok: false; status: 401 | 403; message: string };

/**
 * Who is asking and may they: the one check behind every page, route handler and action.
 * The role is read from the database, not the cookie, so a disabled user or a changed role
 * takes effect on the next request.
 */
export async function checkAccess(allowed: readonly Role[]): Promise<Access> {
  const id = await readSessionUserId();
  const user = id === null ? undefined : await findUserById(getDb(), id);
  if (!user || user.disabled) return { ok: false, status: 401, message: "Sign in to continue." };
  if (!allowed.includes(user.role))
    return { ok: false, status: 403, message: "Your role may not do this." };
  return { ok: true, user };
}

/** For route handlers: throws an HttpError that the handler wrapper answers as 401 or 403. */
export async function requireApiUser(allowed: readonly Role[]): Promise<User> {
  const access = await checkAccess(allowed);
  if (!access.ok)
    throw new HttpError(
      access.status,
      access.status === 401 ? "unauthenticated" : "forbidden",
      access.message,
    );
  return access.user;
}

/** For pages: anonymous visitors go to sign-in, the wrong role to the no-access page. */
export async function requirePageUser(allowed: readonly Role[], returnTo = "/"): Promise<User> {
  const access = await checkAccess(allowed);
  if (access.ok) return access.user;
  if (access.status === 401) redirect(`/sign-in?next=${encodeURIComponent(returnTo)}`);
  redirect("/no-access");
}

export const ALL_ROLES: readonly Role[] = ["owner", "machinist", "counter", "customer"];
export const SHOP_ROLES: readonly Role[] = ["owner", "machinist", "counter"];
