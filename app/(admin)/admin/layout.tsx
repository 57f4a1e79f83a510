import { forbidden } from "next/navigation";
import type { ReactNode } from "react";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";

/**
 * Pages for administrators: other roles get app/forbidden.tsx with a 403 status. A layout of its
 * own, below the shell's, so the refusal renders inside the app shell. Each page checks again,
 * since Next renders a layout and its page in parallel.
 */
export default async function AdminLayout({ children }: { children: ReactNode }) {
  const user = await currentUser();
  if (!user || !can(user.role, "user.manage")) forbidden();
  return children;
}
