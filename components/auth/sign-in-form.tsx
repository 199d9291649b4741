"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { signInSchema } from "@/lib/validation/users";

type Values = z.input<typeof signInSchema>;

export function SignInForm({ next, initialError }: { next: string; initialError?: string }) {
  const router = useRouter();
  const [failure, setFailure] = useState(initialError);
  const { register, handleSubmit, formState } = useForm<Values>({
    resolver: zodResolver(signInSchema),
  });

  async function onSubmit(values: Values) {
    setFailure(undefined);
    const result = await signIn("credentials", { ...values, redirect: false });
    if (!result || result.error) {
      setFailure(
        result?.error && result.error !== "CredentialsSignin" ? result.error : "Sign-in failed.",
      );
      return;
    }
    router.replace(next);
    router.refresh();
  }

  const { errors, isSubmitting } = formState;
  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
      <div>
        <label htmlFor="email" className="mb-1 block text-sm font-semibold">
          E-mail
        </label>
        <input
          id="email"
          type="email"
          autoComplete="username"
          autoFocus
          className="field-input"
          {...register("email")}
        />
        {errors.email ? <p className="mt-1 text-sm text-replace">{errors.email.message}</p> : null}
      </div>
      <div>
        <label htmlFor="password" className="mb-1 block text-sm font-semibold">
          Password
        </label>
        <input
          id="password"
          type="password"
          autoComplete="current-password"
          className="field-input"
          {...register("password")}
        />
        {errors.password ? (
          <p className="mt-1 text-sm text-replace">{errors.password.message}</p>
        ) : null}
      </div>
      <div aria-live="polite" data-testid="sign-in-message">
        {failure ? <p className="rounded bg-red-50 p-3 text-sm text-replace">{failure}</p> : null}
      </div>
      <button type="submit" className="btn-primary w-full" disabled={isSubmitting}>
        {isSubmitting ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
