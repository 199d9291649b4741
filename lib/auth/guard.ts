import { redirect } from "next/navigation";
import { getDb } from "@/db/client";
import { isSessionEnded } from "@/db/sessions";
import { findUserForSession, type User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";
import { SESSION_ENDED } from "./messages";
import { type Permission, may } from "./policy";
import { readSession } from "./session";

export type Access =
  { ok: true; user: User } | { ok: false; status: 401 | 403; message: string; ended?: boolean };

/**
 * Who is asking and may they: the one check behind every page, route handler and action.
 * The role is read from the database, not the cookie, so a disabled user or a changed role
 * takes effect on the next request. The cookie's session version must be the user's current one
 * (a disable, a role or password change adds one) and its session must not have been signed out.
 */
export async function checkPermission(permission: Permission): Promise<Access> {
  const claim = await readSession();
  if (!claim) return { ok: false, status: 401, message: "Sign in to continue." };
  const found = await findUserForSession(getDb(), claim.userId);
  const user = found?.user;
  // A cookie issued before a disable, a role or password change, or one signed out, has ended.
  if (
    !found ||
    !user ||
    user.disabled ||
    claim.sessionVersion !== found.sessionVersion ||
    (claim.sid !== null && (await isSessionEnded(getDb(), claim.sid)))
  )
    return { ok: false, status: 401, message: SESSION_ENDED, ended: true };
  if (!may(user, permission))
    return { ok: false, status: 403, message: "Your role may not do this." };
  return { ok: true, user };
}

/**
 * For route handlers: the signed-in user if they hold the permission; otherwise throws an
 * HttpError that the handler wrapper answers as 401 or 403. A customer's ownership of the record
 * is checked where the record is read (`findJobForUser` and its kin ask `may` with the record).
 */
export async function requireApiPermission(permission: Permission): Promise<User> {
  return userOrThrow(await checkPermission(permission));
}

/** For pages: anonymous visitors go to sign-in (back to `returnTo`), the wrong role to no-access. */
export async function requirePagePermission(permission: Permission, returnTo = "/"): Promise<User> {
  return userOrRedirect(await checkPermission(permission), returnTo);
}

function userOrThrow(access: Access): User {
  if (!access.ok)
    throw new HttpError(
      access.status,
      access.status === 401 ? "unauthenticated" : "forbidden",
      access.message,
    );
  return access.user;
}

function userOrRedirect(access: Access, returnTo: string): User {
  if (access.ok) return access.user;
  if (access.status === 401)
    redirect(`/sign-in?next=${encodeURIComponent(returnTo)}${access.ended ? "&expired=1" : ""}`);
  redirect("/no-access");
}
