/** @type {import('next').NextConfig} */
const nextConfig = {
  serverExternalPackages: ['knex', 'better-sqlite3', '@node-rs/argon2', 'pino', 'nodemailer', 'pdf-lib'],
  poweredByHeader: false,
  reactStrictMode: true,
  typedRoutes: false,
  experimental: { authInterrupts: true },
  outputFileTracingRoot: import.meta.dirname,
  turbopack: { root: import.meta.dirname },
};

export default nextConfig;
