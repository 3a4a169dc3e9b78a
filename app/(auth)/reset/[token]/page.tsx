import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/AuthCard";
import { LinkProblem } from "@/components/auth/LinkProblem";
import { SetPasswordForm } from "@/components/auth/SetPasswordForm";
import { linkState } from "@/server/facade";

export const metadata: Metadata = { title: "Choose a new password" };
export const dynamic = "force-dynamic";

export default async function ResetPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await linkState(token);
  if (link.state !== "valid" || link.kind !== "reset") {
    return (
      <AuthCard title="Choose a new password">
        <LinkProblem state={link.state === "valid" ? "unknown" : link.state} kind="reset" />
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Choose a new password" lead={`For ${link.email}. The old password stops working once you save.`}>
      <SetPasswordForm token={token} email={link.email} action="Save password and sign in" />
    </AuthCard>
  );
}
