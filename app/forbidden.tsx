import type { Metadata } from "next";
import { AppShell } from "@/components/app-shell";
import { Forbidden } from "@/components/forbidden";
import { currentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Not allowed" };

/**
 * What `forbidden()` renders, with a 403 status. It sits at the root, above the group layouts,
 * so it draws the app shell itself for the signed-in person the page refused.
 */
export default async function ForbiddenPage() {
  const user = await currentUser();
  return user ? (
    <AppShell user={user}>
      <Forbidden />
    </AppShell>
  ) : (
    <main className="mx-auto max-w-3xl px-4 py-10">
      <Forbidden />
    </main>
  );
}
