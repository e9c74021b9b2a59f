/** @type {import('next').NextConfig} */
const nextConfig = {
  // PGlite loads its WebAssembly and data files from its own package folder at run time,
  // and argon2 is a native addon: both must stay outside the server bundle.
  serverExternalPackages: ["@electric-sql/pglite", "@node-rs/argon2", "pg"],
  poweredByHeader: false,
  reactStrictMode: true,
  // Never open the database at build time: every page that reads it is dynamic.
  typedRoutes: false,
};

export default nextConfig;
