import Link from "next/link";
import { PageTitle, Panel } from "@/components/ui/panel";

/** What a signed-in person sees on a page their role may not use (the server refuses its actions too). */
export function Forbidden() {
  return (
    <>
      <PageTitle kicker="403 · Not allowed" title="This page is not open to your role" />
      <Panel>
        <p className="text-sm">
          Your account is signed in, but its role does not include this page. If you need it, ask your lab&apos;s administrator to change your role.
        </p>
        <p className="mt-3 text-sm">
          <Link href="/" className="text-copper-dark underline-offset-2 hover:underline">
            Back to the start page
          </Link>
        </p>
      </Panel>
    </>
  );
}
