"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { signInErrorMessage } from "@/lib/crew/sign-in-errors";

const SignInSchema = z.object({
  email: z.string().trim().email("Enter the e-mail address of your Tessera account."),
  password: z.string().min(1, "Enter your password."),
});
type SignInValues = z.infer<typeof SignInSchema>;

/** `initialError` is the `?error=` next-auth redirected here with, when the form was posted without script. */
export function SignInForm({ callbackUrl, initialError }: { callbackUrl: string; initialError?: string }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | null>(signInErrorMessage(initialError));
  const { register, handleSubmit, formState } = useForm<SignInValues>({ resolver: zodResolver(SignInSchema) });

  const onSubmit = handleSubmit(async (values) => {
    setFailure(null);
    const result = await signIn("credentials", { ...values, redirect: false });
    if (!result || result.error) {
      setFailure(signInErrorMessage(result?.error ?? "unknown"));
      return;
    }
    router.replace(callbackUrl);
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      <label className="flex flex-col gap-1 text-sm">
        <span className="text-ink-300">E-mail</span>
        <input
          type="email"
          autoComplete="username"
          className="rounded-md border border-ink-700 bg-ink-800 px-3 py-2 text-ink-100"
          {...register("email")}
        />
        {formState.errors.email && <span className="text-coral">{formState.errors.email.message}</span>}
      </label>
      <label className="flex flex-col gap-1 text-sm">
        <span className="text-ink-300">Password</span>
        <input
          type="password"
          autoComplete="current-password"
          className="rounded-md border border-ink-700 bg-ink-800 px-3 py-2 text-ink-100"
          {...register("password")}
        />
        {formState.errors.password && <span className="text-coral">{formState.errors.password.message}</span>}
      </label>
      {failure && (
        <p role="alert" className="rounded-md border border-coral/40 bg-coral/10 px-3 py-2 text-sm text-coral">
          {failure}
        </p>
      )}
      <button
        type="submit"
        disabled={formState.isSubmitting}
        className="rounded-md bg-tide px-3 py-2 font-medium text-ink-950 disabled:opacity-60"
      >
        {formState.isSubmitting ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
