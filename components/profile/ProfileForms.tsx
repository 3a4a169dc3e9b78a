"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { PasswordSchema } from "@/lib/crew/schemas";
import { BUTTON_CLASS, Field, INPUT_CLASS, Outcome } from "../admin/Field";
import { sendJson } from "../admin/send-json";

const NameSchema = z.object({ name: z.string().trim().min(1, "Enter your name.").max(120) });
const PasswordChangeSchema = z
  .object({ currentPassword: z.string().min(1, "Enter your current password."), newPassword: PasswordSchema, confirm: z.string() })
  .refine((v) => v.newPassword === v.confirm, { message: "The two new passwords differ.", path: ["confirm"] });

type Outcomes = { ok: boolean; text: string } | null;

function NameForm({ name }: { name: string }) {
  const router = useRouter();
  const [outcome, setOutcome] = useState<Outcomes>(null);
  const { register, handleSubmit, formState } = useForm<z.input<typeof NameSchema>, unknown, z.output<typeof NameSchema>>({ resolver: zodResolver(NameSchema), defaultValues: { name } });
  const onSubmit = handleSubmit(async (values) => {
    const result = await sendJson("PATCH", "/api/me", values);
    setOutcome(result.ok ? { ok: true, text: "Name saved." } : { ok: false, text: result.message ?? "Not saved." });
    if (result.ok) router.refresh();
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Your name" className="space-y-3 rounded-lg border border-ink-700 bg-ink-900 p-4">
      <h2 className="text-sm font-semibold">Name</h2>
      <Field label="Name" error={formState.errors.name?.message}>
        <input autoComplete="name" className={INPUT_CLASS} {...register("name")} />
      </Field>
      <Outcome outcome={outcome} />
      <button type="submit" disabled={formState.isSubmitting} className={BUTTON_CLASS}>
        Save name
      </button>
    </form>
  );
}

function PasswordForm({ email }: { email: string }) {
  const [outcome, setOutcome] = useState<Outcomes>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<z.infer<typeof PasswordChangeSchema>>({
    resolver: zodResolver(PasswordChangeSchema),
    defaultValues: { currentPassword: "", newPassword: "", confirm: "" },
  });
  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    const result = await sendJson("PATCH", "/api/me", { currentPassword, newPassword });
    if (!result.ok) {
      const current = result.fields?.currentPassword?.[0];
      if (current) setError("currentPassword", { message: current });
      setOutcome({ ok: false, text: result.message ?? "Not changed." });
      return;
    }
    reset();
    setOutcome({ ok: true, text: "Password changed. Use the new one next time you sign in." });
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Change your password" className="space-y-3 rounded-lg border border-ink-700 bg-ink-900 p-4">
      <h2 className="text-sm font-semibold">Password</h2>
      <input type="email" value={email} autoComplete="username" readOnly hidden />
      <Field label="Current password" error={formState.errors.currentPassword?.message}>
        <input type="password" autoComplete="current-password" className={INPUT_CLASS} {...register("currentPassword")} />
      </Field>
      <Field label="New password" error={formState.errors.newPassword?.message}>
        <input type="password" autoComplete="new-password" className={INPUT_CLASS} {...register("newPassword")} />
      </Field>
      <Field label="Repeat the new password" error={formState.errors.confirm?.message}>
        <input type="password" autoComplete="new-password" className={INPUT_CLASS} {...register("confirm")} />
      </Field>
      <Outcome outcome={outcome} />
      <button type="submit" disabled={formState.isSubmitting} className={BUTTON_CLASS}>
        Change password
      </button>
    </form>
  );
}

/** The signed-in user's own name and password. */
export function ProfileForms({ name, email }: { name: string; email: string }) {
  return (
    <div className="grid items-start gap-4 md:grid-cols-2">
      <NameForm name={name} />
      <PasswordForm email={email} />
    </div>
  );
}
