import type { NextConfig } from "next";
import { apiContentSecurityPolicy, staticSecurityHeaders } from "./lib/http/security-headers";

const nextConfig: NextConfig = {
  // PGlite ships wasm and data files; bundling them would copy ~15 MB into public static media.
  // tsx loads the analysis worker's TypeScript at run time (lib/ingest/worker/boot.mjs); bundled,
  // its dynamic loader imports cannot be resolved and the build fails.
  serverExternalPackages: ["@electric-sql/pglite", "smtp-server", "nodemailer", "tsx"],
  poweredByHeader: false,
  typedRoutes: false,
  // Type errors are caught by `npm run typecheck` (part of `npm test` and CI); checking again
  // inside every build only doubles the build's time and memory on a 2-core machine.
  typescript: { ignoreBuildErrors: true },
  // `forbidden()` answers a refused page with a real 403 and app/forbidden.tsx.
  experimental: { authInterrupts: true },
  // Pages get their content security policy from proxy.ts (a fresh nonce per response).
  async headers() {
    return [
      { source: "/:path*", headers: staticSecurityHeaders },
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: apiContentSecurityPolicy }] },
    ];
  },
};

export default nextConfig;
