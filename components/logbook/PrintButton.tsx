"use client";

export function PrintButton() {
  return (
    <button type="button" className="rounded-md border border-ink-700 px-3 py-1 text-sm print:hidden" onClick={() => window.print()}>
      Print
    </button>
  );
}
