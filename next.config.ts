import type { NextConfig } from "next";
import { securityHeaders } from "./server/security-headers";

const nextConfig: NextConfig = {
  // Native and stream-heavy server packages stay outside the bundle.
  serverExternalPackages: ["@libsql/client", "libsql", "mqtt", "nodemailer", "bcryptjs", "pdfkit"],
  poweredByHeader: false,
  typedRoutes: false,
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders(process.env.NODE_ENV !== "production") }];
  },
};

export default nextConfig;
