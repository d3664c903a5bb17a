// Security headers of every response: Next adds them to its own (next.config.ts), the custom
// server to the ones it answers itself (server/stream/handler.ts).
//
// Content-Security-Policy: Next's own bootstrap scripts and styles are inline, so scripts and styles
// allow 'unsafe-inline' (pages are prerendered, which rules out per-request nonces); everything else
// comes from our origin only. Charts and QR codes draw from data: and blob: images; a same-origin
// service worker is allowed. No page may be framed by another site.
export function securityHeaders(development: boolean): { key: string; value: string }[] {
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
  return [
    { key: "Content-Security-Policy", value: contentSecurityPolicy },
    { key: "X-Frame-Options", value: "DENY" },
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "Referrer-Policy", value: "same-origin" },
  ];
}
