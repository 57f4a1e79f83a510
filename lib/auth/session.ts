import "server-only";
import { cache } from "react";
import { getAuth } from "./auth";
import { requestHeaders } from "./request-headers";
import { isRole, type Role } from "./roles";

export interface SessionUser {
  id: string;
  name: string;
  email: string;
  role: Role;
}

/** Reads the session from a set of request headers; null when signed out, banned or of an unknown role. */
export async function sessionFromHeaders(headers: Headers): Promise<SessionUser | null> {
  const auth = await getAuth();
  const session = await auth.api.getSession({ headers });
  if (!session) return null;
  const { id, name, email, role, banned } = session.user as typeof session.user & { role?: string; banned?: boolean | null };
  if (banned || !isRole(role)) return null;
  return { id, name, email, role };
}

/** The signed-in user of the current request, read once per request. */
export const currentUser = cache(async (): Promise<SessionUser | null> => sessionFromHeaders(await requestHeaders()));
