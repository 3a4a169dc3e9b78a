"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { ResetRequestSchema } from "@/lib/crew/schemas";
import { BUTTON_CLASS, Field, INPUT_CLASS, Outcome } from "../admin/Field";
import { sendJson } from "../admin/send-json";

type Fields = z.input<typeof ResetRequestSchema>;

/** Asks for a reset link; the answer is the same whether or not the address has an account. */
export function ResetRequestForm() {
  const [outcome, setOutcome] = useState<{ ok: boolean; text: string } | null>(null);
  const { register, handleSubmit, formState } = useForm<Fields, unknown, z.output<typeof ResetRequestSchema>>({ resolver: zodResolver(ResetRequestSchema), defaultValues: { email: "" } });
  const onSubmit = handleSubmit(async (values) => {
    const result = await sendJson<{ message: string }>("POST", "/api/auth-links/reset-request", values);
    setOutcome(result.ok ? { ok: true, text: result.data?.message ?? "Check your mail." } : { ok: false, text: result.message ?? "The request was not sent." });
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Ask for a reset link" className="flex flex-col gap-4">
      <Field label="E-mail" error={formState.errors.email?.message}>
        <input type="email" autoComplete="username" className={INPUT_CLASS} {...register("email")} />
      </Field>
      <Outcome outcome={outcome} />
      <button type="submit" disabled={formState.isSubmitting} className={BUTTON_CLASS}>
        {formState.isSubmitting ? "Sending…" : "Send reset link"}
      </button>
    </form>
  );
}
