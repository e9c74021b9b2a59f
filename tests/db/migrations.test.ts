import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { drizzle } from "drizzle-orm/pglite";
import { migrate } from "drizzle-orm/pglite/migrator";
import { afterAll, describe, expect, it } from "vitest";

/**
 * Migrations that reshape columns must carry existing rows over. Applies the migrations up to a
 * point, writes rows in the old shape, applies the rest, and reads them back in the new shape.
 */
const root = path.join(import.meta.dirname, "../../drizzle");
const journal = JSON.parse(fs.readFileSync(path.join(root, "meta/_journal.json"), "utf8")) as { entries: { tag: string }[] };
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "airtally-migrations-"));

/** A migrations folder holding only the first `n` migrations. */
function migrationsUpTo(n: number): string {
  const dir = path.join(tmp, `upto-${n}`);
  fs.mkdirSync(path.join(dir, "meta"), { recursive: true });
  const entries = journal.entries.slice(0, n);
  for (const e of entries) fs.copyFileSync(path.join(root, `${e.tag}.sql`), path.join(dir, `${e.tag}.sql`));
  fs.writeFileSync(path.join(dir, "meta/_journal.json"), JSON.stringify({ ...journal, entries }));
  return dir;
}

const client = new PGlite();
afterAll(async () => {
  await client.close();
  fs.rmSync(tmp, { recursive: true, force: true });
});

describe("field-entry design migration", () => {
  it("keeps each project's tolerances and each terminal's direction", async () => {
    const db = drizzle({ client });
    const before = journal.entries.findIndex((e) => e.tag.endsWith("field-entry-design"));
    expect(before).toBeGreaterThan(0);
    await migrate(db, { migrationsFolder: migrationsUpTo(before) });
    await client.exec(`
      insert into projects (id, name, site_name, terminal_tolerance_pct, section_tolerance_pct, fan_tolerance_pct)
        values ('00000000-0000-4000-8000-000000000001', 'P', 'Site', 7, 12, 4);
      insert into air_systems (id, project_id, tag, name, kind, design_flow_m3_s)
        values ('00000000-0000-4000-8000-000000000002', '00000000-0000-4000-8000-000000000001', 'EF-9', 'Exhaust', 'exhaust', 1);
      insert into duct_sections (id, system_id, tag, kind, shape, diameter_mm, design_flow_m3_s)
        values ('00000000-0000-4000-8000-000000000003', '00000000-0000-4000-8000-000000000002', 'X', 'trunk', 'round', 300, 1);
      insert into terminals (section_id, tag, kind, design_flow_m3_s) values
        ('00000000-0000-4000-8000-000000000003', 'EG-1', 'exhaust', 0.1),
        ('00000000-0000-4000-8000-000000000003', 'SD-1', 'supply', 0.1);
    `);
    await migrate(db, { migrationsFolder: root });
    const project = await client.query<Record<string, number>>(
      "select outlet_tolerance_minus_pct, outlet_tolerance_plus_pct, section_tolerance_minus_pct, section_tolerance_plus_pct, fan_tolerance_minus_pct, fan_tolerance_plus_pct, outside_air_tolerance_minus_pct, outside_air_tolerance_plus_pct from projects",
    );
    expect(project.rows[0]).toEqual({
      outlet_tolerance_minus_pct: 7,
      outlet_tolerance_plus_pct: 7,
      section_tolerance_minus_pct: 12,
      section_tolerance_plus_pct: 12,
      fan_tolerance_minus_pct: 4,
      fan_tolerance_plus_pct: 4,
      outside_air_tolerance_minus_pct: 0,
      outside_air_tolerance_plus_pct: 10,
    });
    const terminals = await client.query<{ tag: string; service: string; type: string }>("select tag, service, type from terminals order by tag");
    expect(terminals.rows).toEqual([
      { tag: "EG-1", service: "exhaust", type: "grille" },
      { tag: "SD-1", service: "supply", type: "diffuser" },
    ]);
    // Two migration runs on a fresh PGlite: about 25 s on the shared 2-core machine, more when it is busy.
  }, 120_000);
});
