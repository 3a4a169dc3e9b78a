"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { InviteSchema, type CrewMember } from "@/lib/crew/schemas";
import { ROLES } from "@/lib/vocabulary";
import { BUTTON_CLASS, Field, INPUT_CLASS, Outcome } from "../admin/Field";
import { sendJson } from "../admin/send-json";

type InviteFields = z.input<typeof InviteSchema>;

/** Invites a user by e-mail; the invitee sets a password through the link in the message. */
export function InviteForm() {
  const router = useRouter();
  const [outcome, setOutcome] = useState<{ ok: boolean; text: string } | null>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<InviteFields, unknown, z.output<typeof InviteSchema>>({
    resolver: zodResolver(InviteSchema),
    defaultValues: { name: "", email: "", role: "viewer" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setOutcome(null);
    const result = await sendJson<{ user: CrewMember }>("POST", "/api/users", values);
    if (!result.ok) {
      for (const [field, messages] of Object.entries(result.fields ?? {})) {
        if (field === "email" || field === "name" || field === "role") setError(field, { message: messages[0] });
      }
      setOutcome({ ok: false, text: result.message ?? "The invite was not sent." });
      if (result.status === 503) router.refresh();
      return;
    }
    setOutcome({ ok: true, text: `Invite sent to ${values.email} as ${values.role}.` });
    reset({ name: "", email: "", role: values.role });
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Invite a user" className="space-y-3 rounded-lg border border-ink-700 bg-ink-900 p-4">
      <h2 className="text-sm font-semibold">Invite a user</h2>
      <div className="grid gap-3 sm:grid-cols-[1fr_1fr_10rem_auto] sm:items-end">
        <Field label="Name" error={formState.errors.name?.message}>
          <input autoComplete="off" className={INPUT_CLASS} {...register("name")} />
        </Field>
        <Field label="E-mail" error={formState.errors.email?.message}>
          <input type="email" autoComplete="off" className={INPUT_CLASS} {...register("email")} />
        </Field>
        <Field label="Role" error={formState.errors.role?.message}>
          <select className={INPUT_CLASS} {...register("role")}>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {r}
              </option>
            ))}
          </select>
        </Field>
        <button type="submit" disabled={formState.isSubmitting} className={BUTTON_CLASS}>
          {formState.isSubmitting ? "Sending…" : "Send invite"}
        </button>
      </div>
      <Outcome outcome={outcome} />
    </form>
  );
}
