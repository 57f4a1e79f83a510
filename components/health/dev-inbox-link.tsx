import { can, type Role } from "@/lib/auth/roles";
import { serverEnv } from "@/lib/env";

/** In development `npm start` runs a local mail catcher; engineers and admins get a link to its inbox. */
export function DevInboxLink({ role }: { role: Role }) {
  const url = serverEnv().KNEEPOINT_DEV_INBOX_URL;
  if (!url || !can(role, "dev-inbox.view")) return null;
  return (
    <a href={url} target="_blank" rel="noreferrer" className="text-sm text-copper-dark underline-offset-2 hover:underline">
      Local mail inbox (development)
    </a>
  );
}
