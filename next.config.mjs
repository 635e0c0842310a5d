/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex pulls optional drivers that Turbopack cannot resolve; keep these on the Node side.
  serverExternalPackages: ['knex', 'pg', 'smtp-server', 'mailparser', 'nodemailer', 'piscina', 'pg-boss'],
  // A second build beside the main one (a parallel check on the same checkout) may use its own folder.
  distDir: process.env.NEXT_DIST_DIR || '.next',
  poweredByHeader: false,
  reactStrictMode: true,
};

export default nextConfig;
