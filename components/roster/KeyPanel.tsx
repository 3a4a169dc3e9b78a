"use client";

import { useState } from "react";

/**
 * A robot's secret key, shown the one time the server hands it out (registration or
 * rotation). Nothing keeps it: once the panel is dismissed or the page reloads it is gone.
 */
export function KeyPanel({ robotName, robotId, secret, onDone }: { robotName: string; robotId: string; secret: string; onDone: () => void }) {
  const [copied, setCopied] = useState<"yes" | "failed" | null>(null);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(secret);
      setCopied("yes");
    } catch {
      setCopied("failed");
    }
  };
  return (
    <section role="region" aria-label="Secret key, shown once" className="space-y-2 rounded-md border border-tide/50 bg-tide/5 p-4 text-sm">
      <h2 className="font-semibold text-tide">Secret key for {robotName}</h2>
      <p className="text-ink-300">
        This key is <strong className="text-ink-100">shown once</strong>. Copy it into the robot&apos;s configuration now: Tessera keeps only a hash and cannot show it
        again. If it is lost, rotate the key.
      </p>
      <dl className="grid grid-cols-[max-content_1fr] gap-x-3 gap-y-1 font-mono text-xs">
        <dt className="text-ink-500">robot</dt>
        <dd data-testid="new-robot-id">{robotId}</dd>
        <dt className="text-ink-500">key</dt>
        <dd>
          <code data-testid="secret-key" className="break-all rounded bg-ink-950 px-1.5 py-0.5 text-ink-100">
            {secret}
          </code>
        </dd>
      </dl>
      <div className="flex items-center gap-2">
        <button type="button" onClick={() => void copy()} className="rounded-md border border-tide/60 px-3 py-1 text-tide hover:bg-tide/10">
          Copy key
        </button>
        <button type="button" onClick={onDone} className="rounded-md border border-ink-700 px-3 py-1 text-ink-300 hover:text-ink-100">
          I have stored it
        </button>
        <span role="status" className="text-xs text-ink-500">
          {copied === "yes" ? "Copied to the clipboard." : copied === "failed" ? "The browser refused the clipboard; select the key and copy it by hand." : ""}
        </span>
      </div>
    </section>
  );
}
