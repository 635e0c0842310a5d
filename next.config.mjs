/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex pulls optional drivers that Turbopack cannot resolve; keep these on the Node side.
  serverExternalPackages: ['knex', 'pg', 'smtp-server', 'mailparser', 'nodemailer'],
  poweredByHeader: false,
  reactStrictMode: true,
};

export default nextConfig;
