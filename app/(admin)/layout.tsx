import { forbidden, redirect } from "next/navigation";
import type { ReactNode } from "react";
import { AppShell } from "@/components/app-shell";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";

/**
 * Pages for administrators: other roles get app/forbidden.tsx with a 403 status. Each page checks
 * again, since Next renders a layout and its page in parallel.
 */
export default async function AdminLayout({ children }: { children: ReactNode }) {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  if (!can(user.role, "user.manage")) forbidden();
  return <AppShell user={user}>{children}</AppShell>;
}
