import type { Metadata } from "next";
import { ProfileForms } from "@/components/profile/ProfileForms";
import { myProfile, requirePageRole } from "@/server/facade";

export const metadata: Metadata = { title: "Profile" };

export default async function ProfilePage() {
  const user = await requirePageRole("viewer", "/profile");
  const me = await myProfile(user);
  return (
    <section className="mx-auto max-w-4xl space-y-4 p-6">
      <div>
        <h1 className="text-xl font-semibold">Profile</h1>
        <p className="mt-1 text-sm text-ink-500">
          <span className="font-mono">{me.email}</span> · {me.role}
          {me.onCall ? " · on call for alert e-mails" : ""}. Your e-mail address and role are set by an admin.
        </p>
      </div>
      <ProfileForms name={me.name} email={me.email} />
    </section>
  );
}
