import { ChangePasswordForm } from "@/components/auth/change-password-form";
import { requirePagePermission } from "@/lib/auth/guard";

export const metadata = { title: "Change password" };

export default async function ChangePasswordPage() {
  const user = await requirePagePermission("change-own-password", "/account/password");
  return (
    <div className="mx-auto max-w-md">
      <h1 className="mb-1 text-2xl font-semibold">Change password</h1>
      <p className="mb-4 text-sm text-graphite-600">
        Signed in as {user.email}. Changing the password signs this account out everywhere else;
        this session stays signed in.
      </p>
      <ChangePasswordForm />
    </div>
  );
}
