import { execFileSync } from "node:child_process";
import crypto from "node:crypto";
import path from "node:path";
import { defineConfig } from "@playwright/test";

// Workers load this file again: keep the port and secret chosen by the first load.
process.env.AIRTALLY_E2E_PORT ??= execFileSync(process.execPath, [
  "-e",
  "const s=require('net').createServer();s.listen(0,'127.0.0.1',()=>{process.stdout.write(String(s.address().port));s.close()})",
]).toString();
process.env.AIRTALLY_E2E_SECRET ??= crypto.randomBytes(32).toString("base64url");

// A data directory of this checkout's own, wiped and seeded before every run (e2e/support/prepare-data.ts).
process.env.AIRTALLY_E2E_DATA_DIR ??= path.join(import.meta.dirname, ".data", "e2e");
const dataDir = process.env.AIRTALLY_E2E_DATA_DIR;

const port = Number(process.env.AIRTALLY_E2E_PORT);
export const baseURL = `http://127.0.0.1:${port}`;

export default defineConfig({
  testDir: "e2e",
  fullyParallel: false,
  forbidOnly: true,
  retries: 0,
  workers: 2,
  reporter: process.env.CI ? [["list"]] : [["list"], ["html", { open: "never" }]],
  timeout: 30_000,
  expect: { timeout: 10_000 },
  use: {
    baseURL,
    viewport: { width: 1024, height: 768 },
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    launchOptions: {
      // Debian's Chromium: Playwright cannot download its own browser on this network.
      executablePath: process.env.AIRTALLY_CHROMIUM ?? "/usr/bin/chromium",
      args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    },
  },
  // Specs that change shared state run after the others, one stage at a time: the traverse journey
  // adds traverses; the matrix saves preferences as every role; the session spec ends sessions and changes a password.
  projects: [
    { name: "journeys", testIgnore: /(authorization-matrix|sessions|traverse|review|engineer)\.spec\.ts/ },
    // The traverse journey adds traverses to the demo's exhaust sections, which the journeys show untouched.
    { name: "traverse", testMatch: /traverse\.spec\.ts/, dependencies: ["journeys"] },
    // The review journey submits, returns and approves a traverse of the exhaust trunk.
    { name: "review", testMatch: /review\.spec\.ts/, dependencies: ["traverse"] },
    // The engineer of record's journey reads the remaining outlets and accepts a deviation.
    { name: "engineer", testMatch: /engineer\.spec\.ts/, dependencies: ["review"] },
    { name: "matrix", testMatch: /authorization-matrix\.spec\.ts/, dependencies: ["engineer"] },
    { name: "sessions", testMatch: /sessions\.spec\.ts/, dependencies: ["matrix"] },
  ],
  webServer: {
    // A fresh data directory with the demo and one issued report, then the production build (rebuilt when
    // sources changed) through the launcher, which also runs the local object store.
    command: "NODE_OPTIONS=--conditions=react-server node_modules/.bin/tsx e2e/support/prepare-data.ts && node_modules/.bin/tsx lib/cli/serve.ts --demo",
    url: `${baseURL}/api/health`,
    env: { PORT: String(port), AIRTALLY_DATA_DIR: dataDir, AIRTALLY_SESSION_SECRET: process.env.AIRTALLY_E2E_SECRET, AIRTALLY_PUBLIC_URL: baseURL },
    timeout: 420_000,
    reuseExistingServer: false,
    stdout: "pipe",
    stderr: "pipe",
  },
});
