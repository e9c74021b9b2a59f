/**
 * Test-only seed step, run before the end-to-end server starts (playwright.config.ts): a fresh data
 * directory with the demo, and one closeout report issued through the real issuing code (a small
 * PDF made here with pdf-lib), so the verification journey has a genuine report to check.
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
  const { issueReport } = await import("@/lib/server/report-issue");
  const { makeTestPdf } = await import("../../tests/support/pdf");
  const s = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");

  const handle = await getDatabaseHandle();
  try {
    await seedDemo(handle.db);
    const [project] = await handle.db.select().from(s.projects).where(eq(s.projects.siteName, "Wrenfield Community Library"));
    const [cx] = await handle.db.select().from(s.users).where(eq(s.users.email, "cx@example.test"));
    const report = await issueReport({
      projectId: project!.id,
      pdf: await makeTestPdf("End-to-end test report"),
      signers: [
        { userId: cx!.id, name: cx!.name, role: "Commissioning agent", at: new Date().toISOString() },
        { name: "Dara Okafor", role: "Engineer of record", at: new Date().toISOString() },
      ],
      issuedBy: cx!.id,
    });
    console.log(`End-to-end data ready in ${dataDir}: report ${report.code} issued.`);
  } finally {
    await handle.close();
    await store.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
