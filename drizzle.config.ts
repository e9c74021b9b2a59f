import { defineConfig } from "drizzle-kit";

// Migrations are generated from db/schema.ts into drizzle/ and applied by the app on start
// (db/migrate.ts), on PGlite or on a PostgreSQL server alike.
export default defineConfig({
  dialect: "postgresql",
  schema: "./db/schema.ts",
  out: "./drizzle",
  strict: true,
});
