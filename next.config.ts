import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // Native and stream-heavy server packages stay outside the bundle.
  serverExternalPackages: ["@libsql/client", "libsql", "mqtt", "nodemailer", "bcryptjs", "pdfkit"],
  poweredByHeader: false,
  typedRoutes: false,
};

export default nextConfig;
