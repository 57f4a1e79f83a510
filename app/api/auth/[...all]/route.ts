import { getAuth } from "@/lib/auth/auth";

// better-auth's own endpoints (sign-in, sign-out, session). The auth instance is created on the
// first request so that building the app never opens the database.
async function handle(request: Request): Promise<Response> {
  const auth = await getAuth();
  return auth.handler(request);
}

export const GET = handle;
export const POST = handle;
