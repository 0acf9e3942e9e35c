/** @type {import('next').NextConfig} */
const nextConfig = {
  // The test command builds into its own folder so a running `npm start` keeps its build.
  distDir: process.env.QUELL_DIST_DIR || ".next",
  serverExternalPackages: ["knex", "pg", "bcryptjs", "nodemailer"],
  poweredByHeader: false,
  reactStrictMode: true,
  // The test command runs `tsc --noEmit` over the whole repository (tests and scripts too) as its own step.
  typescript: { ignoreBuildErrors: true },
  // forbidden() renders app/forbidden.tsx with HTTP 403 when a signed-in user lacks the role (lib/auth/current.ts).
  experimental: { authInterrupts: true },
};

export default nextConfig;
