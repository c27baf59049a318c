/** @type {import('next').NextConfig} */
const nextConfig = {
  // Benchmarks build into their own directory (TROPOPASS_DIST_DIR) so a demo or test server serving
  // `.next` from the same checkout never loses its chunks to a rebuild.
  distDir: process.env.TROPOPASS_DIST_DIR || '.next',
  // The payment SDK stays one module instance: bundled into several server chunks, its error classes
  // differ between chunks and `instanceof` misses a declined card or an unknown invoice (500s).
  serverExternalPackages: [
    'knex',
    'better-sqlite3',
    '@node-rs/argon2',
    'pino',
    'nodemailer',
    'pdf-lib',
    'piscina',
    'pg-boss',
    'stripe',
  ],
  poweredByHeader: false,
  reactStrictMode: true,
  typedRoutes: false,
  experimental: { authInterrupts: true },
  outputFileTracingRoot: import.meta.dirname,
  turbopack: { root: import.meta.dirname },
  // The JSON API, health and webhook routes skip proxy.ts (a nonce is of no use to JSON, and the proxy
  // costs about 0.75 ms a request); they get these fixed headers instead, and the handler spine
  // marks every /api/v1 answer no-store.
  async headers() {
    const api = [
      { key: 'Content-Security-Policy', value: "default-src 'none'; frame-ancestors 'none'" },
      { key: 'X-Content-Type-Options', value: 'nosniff' },
      { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
    ];
    return ['/api/v1/:path*', '/api/health', '/api/webhooks/:path*'].map((source) => ({ source, headers: api }));
  },
};

export default nextConfig;
