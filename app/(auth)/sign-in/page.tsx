import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/SignInForm";
import { currentUser } from "@/server/facade";

export const metadata: Metadata = { title: "Sign in" };

function safeCallback(raw: string | string[] | undefined): string {
  const value = Array.isArray(raw) ? raw[0] : raw;
  // Only same-site paths: an absolute URL here would be an open redirect.
  return value && value.startsWith("/") && !value.startsWith("//") ? value : "/floor";
}

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const callbackUrl = safeCallback(params.callbackUrl);
  if (await currentUser()) redirect(callbackUrl);
  return (
    <main className="flex min-h-full items-center justify-center p-6">
      <div className="w-full max-w-sm rounded-xl border border-ink-700 bg-ink-900 p-8 shadow-xl">
        <div className="mb-6">
          <p className="font-mono text-xs tracking-[0.3em] text-tide">TESSERA</p>
          <h1 className="mt-2 text-xl font-semibold">Sign in to the floor</h1>
          <p className="mt-1 text-sm text-ink-500">Fleet localisation, dispatch and safety holds.</p>
        </div>
        <SignInForm callbackUrl={callbackUrl} initialError={typeof params.error === "string" ? params.error : undefined} />
        <p className="mt-4 text-sm">
          <Link href="/reset" className="text-ink-300 underline underline-offset-4 hover:text-ink-100">
            Forgot password?
          </Link>
        </p>
      </div>
    </main>
  );
}
