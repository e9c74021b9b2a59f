import path from "node:path";
import { defineConfig } from "vitest/config";

const root = import.meta.dirname;

export default defineConfig({
  resolve: {
    alias: {
      "@": root,
      // Queries are marked server-only for Next; under vitest they simply run on the server.
      "server-only": path.join(root, "node_modules/server-only/empty.js"),
    },
  },
  test: {
    include: ["tests/**/*.test.ts"],
    environment: "node",
    // Database code under test opens a throwaway in-memory PGlite with the real migrations.
    env: { AIRTALLY_DATA_DIR: "memory://" },
    // Database tests each hold an in-memory PGlite (~775 MB); two workers fit the 2-core machine.
    pool: "forks",
    maxWorkers: 2,
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
