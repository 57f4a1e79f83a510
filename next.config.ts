import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // PGlite ships wasm and data files; bundling them would copy ~15 MB into public static media.
  serverExternalPackages: ["@electric-sql/pglite", "smtp-server", "nodemailer"],
  poweredByHeader: false,
  typedRoutes: false,
};

export default nextConfig;
