import type { NextConfig } from "next";

const isDev = process.env.NODE_ENV !== "production";

// The app loads nothing from other origins: fonts ship with it and charts are drawn locally.
const contentSecurityPolicy = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "frame-ancestors 'none'",
  "form-action 'self'",
  "base-uri 'self'",
  "object-src 'none'",
].join("; ");

const nextConfig: NextConfig = {
  // A separate build folder per checkout or engineer (NEXT_DIST_DIR) keeps parallel builds apart.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  poweredByHeader: false,
  // `npm test` runs tsc over the whole project as its own step; the build need not repeat it.
  typescript: { ignoreBuildErrors: true },
  // forbidden() renders app/forbidden.tsx for a page the member's role may not open;
  // optimizePackageImports: import only the modules a barrel import names (the dashboard and chart libraries).
  experimental: { authInterrupts: true, optimizePackageImports: ["@tremor/react", "recharts", "swr"] },
  reactStrictMode: true,
  serverExternalPackages: ["pg", "pino", "smtp-server", "mailparser", "nodemailer"],
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "Content-Security-Policy", value: contentSecurityPolicy },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
        ],
      },
    ];
  },
};

export default nextConfig;
