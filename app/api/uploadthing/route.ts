import type { NextRequest } from "next/server";
import { createRouteHandler } from "uploadthing/next";
import { assertSameOriginMutation } from "@/lib/auth/origin";
import { can } from "@/lib/auth/roles";
import { sessionFromHeaders } from "@/lib/auth/session";
import { AppError, errorResponse } from "@/lib/http/errors";
import { uploadEnv } from "@/lib/uploads/env";
import { benchFileRouter } from "./core";

const handler = createRouteHandler({ router: benchFileRouter });

/** The route's file types and limits; the SDK's browser client reads them. Public, as they reveal nothing. */
export async function GET(request: NextRequest): Promise<Response> {
  return handler.GET(request);
}

/**
 * Upload requests from the browser need a signed-in uploader on a page of this site (401/403 in
 * the app's usual shape before the SDK sees them). Callbacks from the upload service carry no session: the SDK
 * verifies their HMAC signature with the API key instead.
 */
export async function POST(request: NextRequest): Promise<Response> {
  try {
    uploadEnv();
    if (!request.headers.get("uploadthing-hook")) {
      assertSameOriginMutation(request);
      const user = await sessionFromHeaders(request.headers);
      if (!user) throw new AppError("unauthenticated", "Sign in to upload bench logs.");
      if (!can(user.role, "run.upload")) throw new AppError("forbidden", "Your role does not allow uploading bench logs.");
    }
  } catch (error) {
    return errorResponse(error);
  }
  return handler.POST(request);
}
