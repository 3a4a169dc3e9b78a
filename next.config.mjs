import { PHASE_DEVELOPMENT_SERVER } from "next/constants.js";

/**
 * The content security policy every page is served under. Next's App Router writes its
 * flight data in inline scripts, hence 'unsafe-inline' for scripts; everything else comes
 * from Tessera's own origin (fonts ship inside the app, the live feed is same-origin).
 * The dev server adds 'unsafe-eval' for React's dev tooling. The phase decides, not
 * NODE_ENV: a build run from a test runner may see NODE_ENV=test, and the headers of a
 * build are fixed when it is made.
 */
const csp = (dev) => [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${dev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "frame-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

const securityHeaders = (dev) => [
  { key: "Content-Security-Policy", value: csp(dev) },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Referrer-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
];

/** @type {(phase: string) => import('next').NextConfig} */
const nextConfig = (phase) => ({
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders(phase === PHASE_DEVELOPMENT_SERVER) }];
  },
  reactStrictMode: true,
  poweredByHeader: false,
  // The custom server (server/index.ts) owns the HTTP listener; Next only renders.
  serverExternalPackages: ["mysql2", "pino", "pino-pretty", "bcryptjs", "socket.io", "nodemailer"],
  // `npm test` runs tsc over the whole project; the build need not type-check it twice.
  typescript: { ignoreBuildErrors: true },
  experimental: {
    // Lets pages call forbidden() so a signed-in user without the role gets a real 403.
    authInterrupts: true,
  },
});

export default nextConfig;
