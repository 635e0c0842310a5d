/**
 * Headers for every route handler's response (pages get theirs, with a CSP nonce, from
 * proxy.ts). The same values as API_SECURITY_HEADERS in lib/security-headers.ts, which says
 * why; tests/integration/security-headers.test.ts checks the two agree.
 */
export const API_SECURITY_HEADERS = {
  'content-security-policy': "default-src 'none'; frame-ancestors 'none'",
  'x-content-type-options': 'nosniff',
  'x-frame-options': 'DENY',
  'referrer-policy': 'no-referrer',
};

/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex pulls optional drivers that Turbopack cannot resolve; keep these on the Node side.
  serverExternalPackages: ['knex', 'pg', 'smtp-server', 'mailparser', 'nodemailer', 'piscina', 'pg-boss'],
  // A second build beside the main one (a parallel check on the same checkout) may use its own folder.
  distDir: process.env.NEXT_DIST_DIR || '.next',
  // Types are checked once, by `tsc --noEmit` in the test command (scripts/test.sh) and CI;
  // the build does not repeat it.
  typescript: { ignoreBuildErrors: true },
  poweredByHeader: false,
  reactStrictMode: true,
  async headers() {
    return [
      {
        source: '/api/:path*',
        headers: Object.entries(API_SECURITY_HEADERS).map(([key, value]) => ({ key, value })),
      },
    ];
  },
};

export default nextConfig;
