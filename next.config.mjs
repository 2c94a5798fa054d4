/** @type {import('next').NextConfig} */
const nextConfig = {
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
        ],
      },
    ];
  },
};

export default nextConfig;
