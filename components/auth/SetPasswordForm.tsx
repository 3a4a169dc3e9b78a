"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { PasswordSchema } from "@/lib/crew/schemas";
import { BUTTON_CLASS, Field, INPUT_CLASS, Outcome } from "../admin/Field";
import { sendJson } from "../admin/send-json";

const Schema = z
  .object({ password: PasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { message: "The two passwords differ.", path: ["confirm"] });
type Values = z.infer<typeof Schema>;

/** Sets a password through an invite or reset link, then signs in with it. */
export function SetPasswordForm({ token, email, action }: { token: string; email: string; action: string }) {
  const router = useRouter();
  const [outcome, setOutcome] = useState<{ ok: boolean; text: string } | null>(null);
  const { register, handleSubmit, formState, setError } = useForm<Values>({ resolver: zodResolver(Schema), defaultValues: { password: "", confirm: "" } });

  const onSubmit = handleSubmit(async ({ password }) => {
    setOutcome(null);
    const result = await sendJson("POST", `/api/auth-links/${encodeURIComponent(token)}`, { password });
    if (!result.ok) {
      const fieldError = result.fields?.password?.[0];
      if (fieldError) setError("password", { message: fieldError });
      setOutcome({ ok: false, text: result.message ?? "The password was not set." });
      return;
    }
    setOutcome({ ok: true, text: "Password set. Signing you in…" });
    const signedIn = await signIn("credentials", { email, password, redirect: false });
    if (!signedIn || signedIn.error) {
      setOutcome({ ok: true, text: "Password set. Sign in with it from the sign-in page." });
      router.replace("/sign-in");
      return;
    }
    router.replace("/floor");
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label={action} className="flex flex-col gap-4">
      <input type="email" value={email} autoComplete="username" readOnly hidden />
      <Field label="New password" error={formState.errors.password?.message}>
        <input type="password" autoComplete="new-password" className={INPUT_CLASS} {...register("password")} />
      </Field>
      <Field label="Repeat the password" error={formState.errors.confirm?.message}>
        <input type="password" autoComplete="new-password" className={INPUT_CLASS} {...register("confirm")} />
      </Field>
      <Outcome outcome={outcome} />
      <button type="submit" disabled={formState.isSubmitting || outcome?.ok} className={BUTTON_CLASS}>
        {action}
      </button>
    </form>
  );
}
