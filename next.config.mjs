/** @type {import('next').NextConfig} */
const nextConfig = {
  // PGlite loads its WebAssembly and data files from its own package folder at run time,
  // and argon2 is a native addon: both must stay outside the server bundle.
  serverExternalPackages: ["@electric-sql/pglite", "@node-rs/argon2", "pg"],
  poweredByHeader: false,
  reactStrictMode: true,
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "X-Frame-Options", value: "DENY" },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "same-origin" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
        ],
      },
    ];
  },
};

export default nextConfig;
