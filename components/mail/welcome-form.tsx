"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import { signIn } from "next-auth/react";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { ApiError, apiFetch } from "@/lib/api-client";
import { acceptInviteSchema } from "@/lib/validation/invites";

type Values = z.input<typeof acceptInviteSchema>;

/** The customer chooses a password from their invite link, and is signed in with it. */
export function WelcomeForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string>();
  const [signInLink, setSignInLink] = useState(false);
  const { register, handleSubmit, formState, setError } = useForm<Values>({
    resolver: zodResolver(acceptInviteSchema),
    defaultValues: { token, password: "", confirm: "" },
  });

  const accept = useMutation({
    mutationFn: (values: Values) =>
      apiFetch("/api/invites/accept", { method: "POST", body: values }),
  });

  async function onSubmit(values: Values) {
    setFailure(undefined);
    try {
      await accept.mutateAsync(values);
    } catch (e) {
      const fields = e instanceof ApiError ? e.fields : {};
      for (const [field, message] of Object.entries(fields)) {
        if (field === "password" || field === "confirm") setError(field, { message });
      }
      setFailure(e instanceof ApiError ? e.message : "The password could not be set; try again.");
      return;
    }
    const result = await signIn("credentials", {
      email,
      password: values.password,
      redirect: false,
    });
    if (!result || result.error) {
      setSignInLink(true);
      return;
    }
    router.replace("/jobs");
    router.refresh();
  }

  if (signInLink) {
    return (
      <p className="text-sm" aria-live="polite">
        Your password is set.{" "}
        <Link href="/sign-in" className="font-semibold underline">
          Sign in
        </Link>{" "}
        with {email}.
      </p>
    );
  }

  const { errors, isSubmitting } = formState;
  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
      <input type="hidden" {...register("token")} />
      <input type="email" value={email} autoComplete="username" readOnly hidden />
      <p className="text-sm text-graphite-600">
        Your account: <span className="font-semibold text-graphite-900">{email}</span>
      </p>
      <div>
        <label htmlFor="password" className="mb-1 block text-sm font-semibold">
          Choose a password{" "}
          <span className="font-normal text-graphite-500">(10 characters or more)</span>
        </label>
        <input
          id="password"
          type="password"
          autoComplete="new-password"
          autoFocus
          className="field-input"
          aria-invalid={errors.password ? true : undefined}
          {...register("password")}
        />
        {errors.password ? (
          <p className="mt-1 text-sm text-replace">{errors.password.message}</p>
        ) : null}
      </div>
      <div>
        <label htmlFor="confirm" className="mb-1 block text-sm font-semibold">
          Type it again
        </label>
        <input
          id="confirm"
          type="password"
          autoComplete="new-password"
          className="field-input"
          aria-invalid={errors.confirm ? true : undefined}
          {...register("confirm")}
        />
        {errors.confirm ? (
          <p className="mt-1 text-sm text-replace">{errors.confirm.message}</p>
        ) : null}
      </div>
      <div aria-live="polite" data-testid="welcome-message">
        {failure ? <p className="rounded bg-red-50 p-3 text-sm text-replace">{failure}</p> : null}
      </div>
      <button type="submit" className="btn-primary w-full" disabled={isSubmitting}>
        {isSubmitting ? "Setting your password…" : "Set password and sign in"}
      </button>
    </form>
  );
}
