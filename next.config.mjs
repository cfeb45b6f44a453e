/** @type {import('next').NextConfig} */
const nextConfig = {
  // The database driver and ORM load optional native pieces at run time; bundling them breaks that.
  serverExternalPackages: ['sequelize', 'mariadb', '@resvg/resvg-js', 'smtp-server', 'mailparser', 'nodemailer'],
  poweredByHeader: false,
  reactStrictMode: true,
};

export default nextConfig;
