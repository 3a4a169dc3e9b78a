import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/AuthCard";
import { LinkProblem } from "@/components/auth/LinkProblem";
import { SetPasswordForm } from "@/components/auth/SetPasswordForm";
import { linkState } from "@/server/facade";

export const metadata: Metadata = { title: "Join the crew" };
export const dynamic = "force-dynamic";

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await linkState(token);
  if (link.state !== "valid" || link.kind !== "invite") {
    return (
      <AuthCard title="Join the crew">
        <LinkProblem state={link.state === "valid" ? "unknown" : link.state} kind="invite" />
      </AuthCard>
    );
  }
  return (
    <AuthCard title={`Welcome, ${link.name}`} lead={`Choose a password for ${link.email} to join Tessera's crew.`}>
      <SetPasswordForm token={token} email={link.email} action="Set password and sign in" />
    </AuthCard>
  );
}
