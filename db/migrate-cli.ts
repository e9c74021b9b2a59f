/** `npm run db:migrate`: applies pending migrations, then exits. Refuses while a server holds the data directory. */
import { defaultDataDir, openDatabase } from "./client";

async function main() {
  const url = process.env.DATABASE_URL || undefined;
  const handle = await openDatabase({ url, dataDir: defaultDataDir() });
  console.log(`Migrations applied (${handle.kind}${url ? "" : `, ${defaultDataDir()}`}).`);
  await handle.close();
}

main().catch((err: Error) => {
  console.error(err.message);
  process.exit(1);
});
