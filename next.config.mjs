/** @type {import('next').NextConfig} */
const nextConfig = {
  // Parallel development builds use their own folders; production and `npm test` use .next.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  reactStrictMode: true,
  // proxy.ts handles trailing slashes (the API must not answer a bare 308).
  skipTrailingSlashRedirect: true,
  poweredByHeader: false,
  // proxy.ts makes Next buffer request bodies up to this size; over it the body is cut short. It must stay above
  // the largest body a route reads (a drive file, 20 MB) so that the route's own limit answers the 413.
  experimental: { proxyClientMaxBodySize: "24mb" },
  serverExternalPackages: ["@node-rs/argon2", "pg", "nodemailer", "pdf-lib", "pdfmake", "pdfkit", "sharp"],
  async headers() {
    return [
      {
        source: "/(.*)",
        headers: [
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
        ],
      },
      // The recorder's writes answer a few dozen bytes ten times a minute per phone: gzip would cost the server more
      // than it saves (Next compresses every streamed answer whatever its size), so these go as they are.
      ...["/api/drives/:driveId/samples", "/api/drives/:driveId/marks"].map((source) => ({
        source,
        headers: [{ key: "Cache-Control", value: "no-store, no-transform" }],
      })),
      {
        source: "/sw.js",
        headers: [
          { key: "Content-Type", value: "application/javascript; charset=utf-8" },
          { key: "Cache-Control", value: "no-cache, no-store, must-revalidate" },
          { key: "Service-Worker-Allowed", value: "/" },
        ],
      },
    ]
  },
}

export default nextConfig
