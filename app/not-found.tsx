import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-full max-w-lg flex-col justify-center gap-4 p-8">
      <p className="font-mono text-sm text-ink-500">404 · not found</p>
      <h1 className="text-2xl font-semibold">There is nothing at this address</h1>
      <Link href="/floor" className="text-tide underline underline-offset-4">
        Back to the live floor
      </Link>
    </main>
  );
}
