import { NextResponse, type NextRequest } from "next/server";
import { newNonce, originOf, pageContentSecurityPolicy } from "@/lib/http/security-headers";

/**
 * Sets each page's content security policy at request time: the nonce must be fresh per response,
 * and the upload service's origin is known only once `npm start` has started it (its port is
 * chosen then), so neither can be baked into the build as next.config.ts headers are.
 */
export function proxy(request: NextRequest) {
  const uploadOrigin = originOf(process.env.UPLOADTHING_INGEST_URL);
  const policy = pageContentSecurityPolicy({
    nonce: newNonce(),
    dev: process.env.NODE_ENV === "development",
    connectOrigins: uploadOrigin ? [uploadOrigin] : [],
  });
  // Next reads the nonce from the request's policy and puts it on the scripts it renders.
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("content-security-policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("content-security-policy", policy);
  return response;
}

export const config = {
  // Pages only: API answers get a fixed deny-all policy from next.config.ts, static files need none.
  matcher: [{ source: "/((?!api/|_next/static|_next/image|favicon.ico|icon.svg|kneepoint-mark.svg).*)" }],
};
