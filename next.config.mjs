/** @type {import('next').NextConfig} */
const nextConfig = {
  // Database and PDF libraries run only on the server and are loaded from node_modules as-is.
  serverExternalPackages: ['sequelize', 'pg', 'pg-hstore', 'pdfkit', 'fontkit', 'nodemailer', 'stripe', 'pg-boss'],
  poweredByHeader: false,
  typedRoutes: false,
  experimental: {
    serverActions: { bodySizeLimit: '12mb' },
  },
};

export default nextConfig;
