/** A plain statement that a screen is not built yet, so nothing pretends to work. */
export function ComingLater({ title, what }: { title: string; what: string }) {
  return (
    <section className="mx-auto max-w-2xl p-8">
      <h1 className="text-xl font-semibold">{title}</h1>
      <p className="mt-3 rounded-lg border border-dashed border-ink-700 p-4 text-sm text-ink-300">
        Not built yet. {what}
      </p>
    </section>
  );
}
