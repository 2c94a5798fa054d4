import { PHASE_DEVELOPMENT_SERVER } from "next/constants.js";

/**
 * Content-Security-Policy: everything from this origin only; no plugins, no
 * framing, forms post only here. Next.js inlines its bootstrap scripts and the
 * theme's first paint, hence 'unsafe-inline' for scripts and styles; `next dev`
 * also needs eval and its hot-reload socket.
 */
function contentSecurityPolicy(dev) {
  return [
    "default-src 'self'",
    `script-src 'self' 'unsafe-inline'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    `connect-src 'self'${dev ? " ws: wss:" : ""}`,
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

/** @type {(phase: string) => import('next').NextConfig} */
const nextConfig = (phase) => ({
  // `next dev` keeps its own output so it never clobbers the build that the
  // demo and the end-to-end tests serve.
  distDir:
    phase === PHASE_DEVELOPMENT_SERVER ? (process.env.NEXT_DEV_DIST_DIR ?? ".next-dev") : ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  // Lint runs in `npm test` with the project's own config; the build only builds.
  eslint: { ignoreDuringBuilds: true },
  experimental: {
    // forbidden() / unauthorized() from next/navigation render 403/401 pages.
    authInterrupts: true,
  },
  serverExternalPackages: ["knex", "mysql2", "bcryptjs"],
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "X-Frame-Options", value: "DENY" },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "same-origin" },
          // Browsers honour HSTS only when it arrives over https (RFC 6797 §8.1),
          // so the plain-http demo on loopback is unaffected.
          { key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" },
          {
            key: "Content-Security-Policy",
            value: contentSecurityPolicy(phase === PHASE_DEVELOPMENT_SERVER),
          },
        ],
      },
    ];
  },
});

export default nextConfig;
