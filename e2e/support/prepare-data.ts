/**
 * Test-only seed step, run before the end-to-end server starts (playwright.config.ts): a fresh data
 * directory with the demo and its closeout report, issued as `npm run demo` issues it (the real
 * builder, approvals and issueReport, db/seed/report.ts), so the journeys check a genuine report.
 * Run with `--conditions=react-server` so server-only modules load outside Next.
 */
import fs from "node:fs";

async function main() {
  const dataDir = process.env.AIRTALLY_DATA_DIR;
  if (!dataDir || dataDir.startsWith("memory://")) throw new Error("AIRTALLY_DATA_DIR must name the end-to-end data directory.");
  fs.rmSync(dataDir, { recursive: true, force: true });
  fs.mkdirSync(dataDir, { recursive: true });

  const { startLocalObjectStore } = await import("@/lib/cli/local-object-store");
  const store = await startLocalObjectStore({ dataDir });
  Object.assign(process.env, store.env);
  const { getDatabaseHandle } = await import("@/db/client");
  const { seedDemo } = await import("@/db/seed/index");
  const { seedDemoReport } = await import("@/db/seed/report");

  const handle = await getDatabaseHandle();
  try {
    await seedDemo(handle.db);
    const outcome = await seedDemoReport();
    if (!outcome.issued) throw new Error(`The demo report was not issued: ${outcome.note}`);
    console.log(`End-to-end data ready in ${dataDir}: ${outcome.note}`);
  } finally {
    await handle.close();
    await store.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
