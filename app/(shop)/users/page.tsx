import { SignInNotices } from "@/components/auth/sign-in-notices";
import { AddUserForm } from "@/components/users/add-user-form";
import { UserRow } from "@/components/users/user-row";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { listCustomers } from "@/db/customers";
import { listThrottleNotices } from "@/db/sign-in-failures";
import { listUsers } from "@/db/users";
import { requirePagePermission } from "@/lib/auth/guard";

export const metadata = { title: "Staff & access" };

export default async function UsersPage() {
  await requirePagePermission("manage-users", "/users");
  const db = getDb();
  const [users, { customers }, notices, { timeZone }] = await Promise.all([
    listUsers(db),
    listCustomers(db, { limit: 500 }),
    listThrottleNotices(db, new Date(Date.now() - 7 * 24 * 60 * 60_000)),
    findCounterSettings(db),
  ]);
  return (
    <section className="space-y-4">
      <h1 className="text-2xl font-semibold">Staff & access</h1>
      <div className="panel relative overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-graphite-200 bg-graphite-50 text-graphite-600">
            <tr>
              <th className="px-4 py-2 font-semibold">Name</th>
              <th className="px-4 py-2 font-semibold">E-mail</th>
              <th className="px-4 py-2 font-semibold">Role</th>
              <th className="px-4 py-2 font-semibold">Access</th>
              <th className="px-4 py-2 font-semibold">Status</th>
            </tr>
          </thead>
          <tbody>
            {users.map((u) => (
              <UserRow key={`${u.id}-${u.role}-${u.disabled}`} user={u} />
            ))}
          </tbody>
        </table>
      </div>
      <SignInNotices notices={notices} timeZone={timeZone} />
      <AddUserForm customers={customers.map((c) => ({ id: c.id, name: c.name }))} />
    </section>
  );
}
