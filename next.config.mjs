/**
 * Headers on every response, including static files and anything that bypasses proxy.ts and
 * handler(); the same values as lib/security/headers.ts (COMMON_HEADERS), which pages and route
 * handlers also set.
 */
const COMMON_HEADERS = [
  { key: 'X-Frame-Options', value: 'DENY' },
  { key: 'X-Content-Type-Options', value: 'nosniff' },
  { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
  {
    key: 'Permissions-Policy',
    value: 'camera=(), microphone=(), geolocation=(), payment=(), usb=(), serial=(), hid=(), midi=()',
  },
  { key: 'Cross-Origin-Opener-Policy', value: 'same-origin' },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  // Database and PDF libraries run only on the server and are loaded from node_modules as-is.
  serverExternalPackages: [
    'sequelize',
    'pg',
    'pg-hstore',
    'pdfkit',
    'fontkit',
    'nodemailer',
    'stripe',
    'pg-boss',
    '@aws-sdk/client-s3',
  ],
  // The container image (Dockerfile) builds with NEXT_OUTPUT=standalone: a self-contained server
  // with only the files it traces. `npm start` and the tests keep the ordinary build and `next start`.
  ...(process.env.NEXT_OUTPUT === 'standalone'
    ? { output: 'standalone', outputFileTracingIncludes: { '/**': ['./fonts/**'] } }
    : {}),
  poweredByHeader: false,
  typedRoutes: false,
  experimental: {
    serverActions: { bodySizeLimit: '12mb' },
    // forbidden() from next/navigation: pages a role may not see answer 403 with app/c/[coop]/forbidden.tsx.
    authInterrupts: true,
  },
  async headers() {
    return [{ source: '/:path*', headers: COMMON_HEADERS }];
  },
};

export default nextConfig;
