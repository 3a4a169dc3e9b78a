import type { ReactNode } from "react";

/** A labelled form control with its error, in the sign-in form's style. */
export function Field({ label, error, children }: { label: string; error?: string; children: ReactNode }) {
  return (
    <label className="flex flex-col gap-1 text-sm">
      <span className="text-ink-300">{label}</span>
      {children}
      {error && <span className="text-coral">{error}</span>}
    </label>
  );
}

export const INPUT_CLASS = "rounded-md border border-ink-700 bg-ink-800 px-3 py-1.5 text-ink-100";
export const BUTTON_CLASS = "rounded-md bg-tide px-3 py-1.5 font-medium text-ink-950 disabled:opacity-60";

/** A status line after a form is sent: role=status for success, role=alert for failure. */
export function Outcome({ outcome }: { outcome: { ok: boolean; text: string } | null }) {
  if (!outcome) return null;
  return outcome.ok ? (
    <p role="status" className="rounded-md border border-tide/40 bg-tide/10 px-3 py-2 text-sm text-tide">
      {outcome.text}
    </p>
  ) : (
    <p role="alert" className="rounded-md border border-coral/40 bg-coral/10 px-3 py-2 text-sm text-coral">
      {outcome.text}
    </p>
  );
}
