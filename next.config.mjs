/** @type {import('next').NextConfig} */
const nextConfig = {
  // The database driver and ORM load optional native pieces at run time, and the thread pool and job
  // queue start their own worker files and Lua scripts from their package folders, and esbuild (which bundles
  // the worker threads' engine) runs its own binary: bundling breaks that.
  serverExternalPackages: ['sequelize', 'mariadb', '@resvg/resvg-js', 'smtp-server', 'mailparser', 'nodemailer', 'piscina', 'bullmq', 'ioredis', 'esbuild'],
  // Separate build folders let several servers of one checkout run side by side (e.g. NEXT_DIST_DIR=.next-dev).
  distDir: process.env.NEXT_DIST_DIR || '.next',
  poweredByHeader: false,
  reactStrictMode: true,
  // Build assets skip proxy.ts (which sets every other reply's security headers).
  async headers() {
    return [{ source: '/_next/static/:path*', headers: [{ key: 'X-Content-Type-Options', value: 'nosniff' }] }];
  },
};

export default nextConfig;
