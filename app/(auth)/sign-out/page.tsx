import type { Metadata } from "next";
import { SignOutButton } from "./sign-out-button";

export const metadata: Metadata = { title: "Sign out" };

export default function SignOutPage() {
  return (
    <>
      <h1 className="mb-2 text-lg font-semibold">Sign out</h1>
      <p className="mb-4 text-sm text-ink-soft">Signing out ends this browser&apos;s session. Uploads already sent keep analysing.</p>
      <SignOutButton />
    </>
  );
}
