/** @type {import('next').NextConfig} */
const nextConfig = {
  // PGlite loads its WebAssembly and data files from its own package folder at run time, argon2
  // and sharp are native addons; the mail, storage and multipart libraries run as Node modules.
  serverExternalPackages: ["@electric-sql/pglite", "@node-rs/argon2", "pg", "sharp", "nodemailer", "@aws-sdk/client-s3", "busboy"],
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
