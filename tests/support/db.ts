import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/index";
import * as s from "@/db/schema";

/** The process's database (in memory under vitest) with the demo seeded, and the ids tests need. */
export async function demoDatabase() {
  const db = await getDb();
  await seedDemo(db);
  const user = async (email: string) => (await db.select().from(s.users).where(eq(s.users.email, email)))[0]!;
  const [library] = await db.select().from(s.projects).where(eq(s.projects.siteName, "Wrenfield Community Library"));
  const [clinic] = await db.select().from(s.projects).where(eq(s.projects.siteName, "Marlow Quay Clinic"));
  return {
    db,
    library: library!,
    clinic: clinic!,
    tech: await user("tech@example.test"),
    cx: await user("cx@example.test"),
    engineer: await user("engineer@example.test"),
    owner: await user("owner@example.test"),
    admin: await user("admin@example.test"),
  };
}
