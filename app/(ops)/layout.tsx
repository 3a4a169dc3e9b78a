import Link from "next/link";
import type { ReactNode } from "react";
import { NavLinks, type NavItem } from "@/components/shell/NavLinks";
import { SignOutButton } from "@/components/shell/SignOutButton";
import { ThemeToggle } from "@/components/shell/ThemeToggle";
import { requirePageRole } from "@/server/facade";

const BASE_NAV: NavItem[] = [
  { href: "/floor", label: "Live floor" },
  { href: "/logbook", label: "Logbook" },
  { href: "/reports", label: "Reports" },
  { href: "/floorplans", label: "Floorplans" },
  { href: "/roster", label: "Roster" },
];

const ADMIN_NAV: NavItem[] = [
  { href: "/crew", label: "Crew" },
  { href: "/audit", label: "Audit" },
  { href: "/mail", label: "Sent mail" },
];

export default async function OpsLayout({ children }: { children: ReactNode }) {
  const user = await requirePageRole("viewer", "/floor");
  const nav = user.role === "admin" ? [...BASE_NAV, ...ADMIN_NAV] : BASE_NAV;
  return (
    <div className="flex min-h-full flex-col">
      <header className="flex items-center justify-between gap-4 border-b border-ink-700 bg-ink-900 px-4 py-2 print:hidden">
        <div className="flex items-center gap-6">
          <span className="font-mono text-sm tracking-[0.3em] text-tide">TESSERA</span>
          <NavLinks items={nav} />
        </div>
        <div className="flex items-center gap-3 text-sm" data-testid="signed-in-user">
          <Link href="/profile" title="Your profile" className="text-ink-100 underline-offset-4 hover:underline">
            {user.name}
          </Link>
          <span className="rounded bg-ink-800 px-1.5 py-0.5 font-mono text-xs text-ink-300">{user.role}</span>
          <ThemeToggle />
          <SignOutButton />
        </div>
      </header>
      <main className="flex-1">{children}</main>
    </div>
  );
}
