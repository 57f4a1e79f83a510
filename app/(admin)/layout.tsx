import { redirect } from "next/navigation";
import type { ReactNode } from "react";
import { AppShell } from "@/components/app-shell";
import { Forbidden } from "@/components/forbidden";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";

/** Pages for administrators. Each page checks again, since Next renders a layout and its page in parallel. */
export default async function AdminLayout({ children }: { children: ReactNode }) {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  return <AppShell user={user}>{can(user.role, "user.manage") ? children : <Forbidden />}</AppShell>;
}
