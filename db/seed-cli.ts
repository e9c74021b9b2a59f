/** `npm run db:seed`: adds the demo project unless it is already there. Refuses while a server holds the data directory. */
import { defaultDataDir, openDatabase } from "./client";
import { seedDemo } from "./seed/index";

async function main() {
  const handle = await openDatabase({ url: process.env.DATABASE_URL || undefined, dataDir: defaultDataDir() });
  const { seeded } = await seedDemo(handle.db);
  console.log(seeded ? "Demo project seeded." : "Demo data already present: nothing changed.");
  await handle.close();
}

main().catch((err: Error) => {
  console.error(err.message);
  process.exit(1);
});
