import type { Metadata } from "next";
import Link from "next/link";
import { AuthCard } from "@/components/auth/AuthCard";
import { ResetRequestForm } from "@/components/auth/ResetRequestForm";

export const metadata: Metadata = { title: "Forgot password" };

export default function ResetRequestPage() {
  return (
    <AuthCard title="Forgot your password?" lead="Enter your account's e-mail address; a link to choose a new password follows, valid for an hour.">
      <ResetRequestForm />
      <p className="mt-4 text-sm">
        <Link href="/sign-in" className="text-tide underline underline-offset-4">
          Back to sign in
        </Link>
      </p>
    </AuthCard>
  );
}
