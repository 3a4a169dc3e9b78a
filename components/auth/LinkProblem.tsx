import Link from "next/link";
import type { LinkKind } from "@/lib/crew/schemas";

const WHY = { used: "This link has already been used.", expired: "This link has expired.", unknown: "This link is not one Tessera sent, or its account is deactivated." } as const;

/** What a visitor with a dead invite or reset link can do next. */
export function LinkProblem({ state, kind }: { state: keyof typeof WHY; kind: LinkKind }) {
  return (
    <div className="space-y-3 text-sm">
      <p role="alert" className="rounded-md border border-coral/40 bg-coral/10 px-3 py-2 text-coral">
        {WHY[state]}
      </p>
      <p className="text-ink-300">
        {kind === "invite" ? "Ask an admin of your site to send the invite again." : "Ask for a new reset link; it is valid for an hour."}
      </p>
      <p className="flex gap-4">
        {kind === "reset" && (
          <Link href="/reset" className="text-tide underline underline-offset-4">
            New reset link
          </Link>
        )}
        <Link href="/sign-in" className="text-tide underline underline-offset-4">
          Sign in
        </Link>
      </p>
    </div>
  );
}
