import type { ReactNode } from "react";

/** The signed-out pages' card: sign-in, invite, reset. */
export function AuthCard({ title, lead, children }: { title: string; lead?: string; children: ReactNode }) {
  return (
    <main className="flex min-h-full items-center justify-center p-6">
      <div className="w-full max-w-sm rounded-xl border border-ink-700 bg-ink-900 p-8 shadow-xl">
        <div className="mb-6">
          <p className="font-mono text-xs tracking-[0.3em] text-tide">TESSERA</p>
          <h1 className="mt-2 text-xl font-semibold">{title}</h1>
          {lead && <p className="mt-1 text-sm text-ink-500">{lead}</p>}
        </div>
        {children}
      </div>
    </main>
  );
}
