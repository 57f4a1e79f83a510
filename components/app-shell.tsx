import Image from "next/image";
import Link from "next/link";
import type { ReactNode } from "react";
import { navigationFor } from "@/lib/auth/navigation";
import { roleLabels, type Role } from "@/lib/auth/roles";
import { NavLinks } from "./nav-links";

export function AppShell({ user, children }: { user: { name: string; role: Role }; children: ReactNode }) {
  const items = navigationFor(user.role);
  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-3 focus:top-3 focus:z-50 focus:rounded focus:bg-sheet focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="no-print border-b border-rule bg-ink text-paper">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2.5 sm:px-6">
          <Link href="/" className="flex items-center gap-2.5 font-semibold tracking-tight">
            <Image src="/kneepoint-mark.svg" alt="" width={30} height={30} priority />
            <span className="text-lg">Kneepoint</span>
          </Link>
          <NavLinks items={items.map(({ href, label }) => ({ href, label }))} />
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="hidden sm:inline">{user.name}</span>
            <span className="rounded bg-copper px-2 py-0.5 text-xs font-semibold uppercase tracking-wide text-white" data-testid="role-badge">
              {roleLabels[user.role]}
            </span>
            <Link href="/settings" className="underline-offset-4 hover:underline">
              Settings
            </Link>
            <Link href="/sign-out" className="underline-offset-4 hover:underline">
              Sign out
            </Link>
          </div>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-7xl px-4 py-6 sm:px-6">
        {children}
      </main>
    </div>
  );
}
