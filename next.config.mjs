/* global process */
// `next dev` needs eval for React's debugging aids; built apps never do.
const isDev = process.env.NODE_ENV === "development";

// Pages are served with a fixed policy rather than a per-request nonce: a nonce only reaches
// pages rendered per request, and a few pages here (no-access, not-found) are prerendered.
const contentSecurityPolicy = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

export const securityHeaders = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  {
    key: "Permissions-Policy",
    value: "camera=(), microphone=(), geolocation=(), usb=(), browsing-topics=()",
  },
];

/** Paths (without the leading slash) whose answers carry their own Content-Security-Policy. */
export const OWN_POLICY_PATHS = ["api/uploads/", "api/settings/logo$"];

/** @type {import('next').NextConfig} */
const nextConfig = {
  serverExternalPackages: ["better-sqlite3", "sharp"],
  poweredByHeader: false,
  typedRoutes: false,
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders },
      // A header set here replaces the route's own, so the routes that serve stored files with a
      // stricter policy of their own (`sandbox`: lib/uploads/serve.ts, the logo) are left out.
      {
        source: `/:path((?!${OWN_POLICY_PATHS.join("|")}).*)`,
        headers: [{ key: "Content-Security-Policy", value: contentSecurityPolicy }],
      },
    ];
  },
};

export default nextConfig;
