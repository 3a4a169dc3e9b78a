"use client";

import clsx from "clsx";
import Link from "next/link";
import { usePathname } from "next/navigation";

export interface NavItem {
  href: string;
  label: string;
}

export function NavLinks({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Main" className="flex gap-1">
      {items.map((item) => {
        const active = pathname === item.href || pathname.startsWith(`${item.href}/`);
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={active ? "page" : undefined}
            className={clsx(
              "rounded-md px-3 py-1.5 text-sm",
              active ? "bg-ink-800 text-ink-100" : "text-ink-300 hover:bg-ink-800/60 hover:text-ink-100",
            )}
          >
            {item.label}
          </Link>
        );
      })}
    </nav>
  );
}
