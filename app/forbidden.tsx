import Link from "next/link";

export default function Forbidden() {
  return (
    <main className="mx-auto flex min-h-full max-w-lg flex-col justify-center gap-4 p-8">
      <p className="font-mono text-sm text-coral">403 · not allowed</p>
      <h1 className="text-2xl font-semibold">This page needs a role you do not have</h1>
      <p className="text-ink-300">
        Your account can open the live floor, the logbook and reports. Ask an admin of your site if you need more.
      </p>
      <Link href="/floor" className="text-tide underline underline-offset-4">
        Back to the live floor
      </Link>
    </main>
  );
}
