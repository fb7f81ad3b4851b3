/** @type {import('next').NextConfig} */

// The pages' Content-Security-Policy carries a fresh nonce per request and is set
// in proxy.ts. What the proxy does not see (API answers, static files) gets this
// fixed policy: no inline script at all.
const staticContentSecurityPolicy = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join('; ');

const securityHeaders = [
  { key: 'X-Frame-Options', value: 'DENY' },
  { key: 'X-Content-Type-Options', value: 'nosniff' },
  { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
  { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=()' },
];

const nextConfig = {
  // A separate build folder lets browser tests build beside a running dev server.
  distDir: process.env.NEXT_DIST_DIR || '.next',
  poweredByHeader: false,
  // pdfkit reads its font data files and highs its build/highs.wasm beside their own scripts: bundled, they would not be found
  serverExternalPackages: ['knex', 'better-sqlite3', 'pg', 'pg-boss', 'exceljs', 'smtp-server', 'nodemailer', 'pdfkit', 'fontkit', 'highs'],
  async headers() {
    return [
      { source: '/:path*', headers: securityHeaders },
      // the paths proxy.ts does not match (its matcher); the truck API route it matches answers from its handler
      { source: '/api/:path*', headers: [{ key: 'Content-Security-Policy', value: staticContentSecurityPolicy }] },
      { source: '/_next/:path*', headers: [{ key: 'Content-Security-Policy', value: staticContentSecurityPolicy }] },
    ];
  },
};

export default nextConfig;
