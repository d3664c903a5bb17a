import type { NextConfig } from "next";

// Content-Security-Policy for every response. Next's own bootstrap scripts and styles are inline,
// so scripts and styles allow 'unsafe-inline' (pages are prerendered, which rules out per-request
// nonces); everything else comes from our origin only. Charts and QR codes draw from data: and
// blob: images; a same-origin service worker is allowed. No page may be framed by another site.
const development = process.env.NODE_ENV !== "production";
const contentSecurityPolicy = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${development ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  `connect-src 'self'${development ? " ws:" : ""}`,
  "worker-src 'self'",
  "manifest-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

const SECURITY_HEADERS = [
  { key: "Content-Security-Policy", value: contentSecurityPolicy },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "same-origin" },
];

const nextConfig: NextConfig = {
  // Native and stream-heavy server packages stay outside the bundle.
  serverExternalPackages: ["@libsql/client", "libsql", "mqtt", "nodemailer", "bcryptjs", "pdfkit"],
  poweredByHeader: false,
  typedRoutes: false,
  async headers() {
    return [{ source: "/:path*", headers: SECURITY_HEADERS }];
  },
};

export default nextConfig;
