import fs from "node:fs";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { statementEffect, watchPglite, type ReadCache } from "@/db/read-cache";

const ROOT = path.resolve(import.meta.dirname, "../..");

describe("statementEffect", () => {
  it("tells reads, table writes, neutral statements and everything else apart", () => {
    expect(statementEffect(`select "id" from "users" where "id" = $1`)).toEqual({ kind: "read" });
    expect(statementEffect(`  -- note\n/* x */ SELECT 1`)).toEqual({ kind: "read" });
    expect(statementEffect(`insert into "readings" ("id") values ($1) on conflict do nothing`)).toEqual({ kind: "write", table: "readings" });
    expect(statementEffect(`update "users" set "session_version" = "session_version" + 1`)).toEqual({ kind: "update", table: "users", columns: ["session_version"] });
    expect(statementEffect(`UPDATE public.users SET name = 'x'`)).toEqual({ kind: "update", table: "users", columns: ["name"] });
    // An UPDATE names the columns it assigns, wherever commas and keywords sit inside its values.
    expect(
      statementEffect(`update "traverses" set "version" = "traverses"."version" + 1, "updated_at" = $1 where ("traverses"."id" = $2 and "traverses"."version" = $3) returning "id", "status"`),
    ).toEqual({ kind: "update", table: "traverses", columns: ["version", "updated_at"] });
    expect(statementEffect(`UPDATE people SET name = 'a, b where c', "note" = (select max(x) from y where z = 1), age = coalesce(age, 0) FROM other WHERE people.id = other.id`)).toEqual({
      kind: "update",
      table: "people",
      columns: ["name", "note", "age"],
    });
    // A SET list it cannot read with certainty: the whole table.
    expect(statementEffect(`update t set (a, b) = (1, 2)`)).toEqual({ kind: "write", table: "t" });
    expect(statementEffect(`update t set a = 'unterminated`)).toEqual({ kind: "write", table: "t" });
    expect(statementEffect(`update t set a = (1`)).toEqual({ kind: "write", table: "t" });
    for (const neutral of ["begin", "COMMIT", "rollback", "savepoint sp1", "release savepoint sp1", "set search_path to public"]) {
      expect(statementEffect(neutral)).toEqual({ kind: "none" });
    }
    // Cascades, hidden statements and state-changing functions: assume everything was written.
    expect(statementEffect(`delete from "projects" where "id" = $1`)).toEqual({ kind: "write-all" });
    expect(statementEffect(`with moved as (delete from a returning *) insert into b select * from moved`)).toEqual({ kind: "write-all" });
    expect(statementEffect(`insert into a values (1); delete from b`)).toEqual({ kind: "write-all" });
    expect(statementEffect(`select nextval('s')`)).toEqual({ kind: "write-all" });
    expect(statementEffect(`truncate a`)).toEqual({ kind: "write-all" });
    expect(statementEffect(`alter table a add column b int`)).toEqual({ kind: "write-all" });
  });
});

describe("ReadCache on an embedded database", () => {
  let client: PGlite;
  let cache: ReadCache;
  let loads: number;

  // One database for the file (starting one takes seconds); each test starts from the same rows.
  beforeAll(async () => {
    client = new PGlite("memory://");
    await client.exec(`create table people (id int primary key, name text, note text); create table pets (id int primary key, owner int references people(id) on delete cascade, name text, note text);`);
    cache = watchPglite(client, ["people", "pets"]);
  });
  beforeEach(async () => {
    await client.exec(`delete from pets; delete from people; insert into people values (1, 'Ada'); insert into pets values (1, 1, 'Rex');`);
    loads = 0;
  });
  afterAll(() => client.close());

  const names = () =>
    cache.read("names", async () => {
      loads += 1;
      return (await client.query<{ name: string }>(`select "name" from "people" order by "id"`)).rows.map((r) => r.name);
    });

  it("answers a repeated read from memory until a table it read is written", async () => {
    const before = cache.stats();
    expect(await names()).toEqual(["Ada"]);
    expect(await names()).toEqual(["Ada"]);
    expect(loads).toBe(1);
    await client.query(`insert into "pets" values (2, 1, 'Tib')`); // another table: still fresh
    expect(await names()).toEqual(["Ada"]);
    expect(loads).toBe(1);
    await client.query(`update "people" set "name" = 'Ada L.' where "id" = 1`);
    expect(await names()).toEqual(["Ada L."]);
    expect(loads).toBe(2);
    const after = cache.stats();
    expect({ hits: after.hits - before.hits, misses: after.misses - before.misses }).toEqual({ hits: 2, misses: 2 });
  });

  it("sees writes made inside transactions and multi-statement scripts", async () => {
    await names();
    await client.transaction(async (tx) => {
      await tx.query(`insert into "people" values (2, 'Bo')`);
    });
    expect(await names()).toEqual(["Ada", "Bo"]);
    await client.exec(`insert into people values (3, 'Cy'); select 1;`);
    expect(await names()).toEqual(["Ada", "Bo", "Cy"]);
    expect(loads).toBe(3);
  });

  it("treats a delete as a write to every table (foreign keys cascade)", async () => {
    const pets = () => cache.read("pets", async () => (await client.query<{ name: string }>(`select "name" from "pets"`)).rows.map((r) => r.name));
    expect(await pets()).toEqual(["Rex"]);
    await client.query(`delete from "people" where "id" = 1`);
    expect(await pets()).toEqual([]);
  });

  it("does not keep an answer when its table is written while it is being read", async () => {
    const first = await cache.read("racy", async () => {
      const before = (await client.query<{ name: string }>(`select "name" from "people"`)).rows.map((r) => r.name);
      await client.query(`insert into "people" values (2, 'Bo')`); // lands after the read, before it is kept
      return before;
    });
    expect(first).toEqual(["Ada"]);
    const second = await cache.read("racy", async () => (await client.query<{ name: string }>(`select "name" from "people" order by "id"`)).rows.map((r) => r.name));
    expect(second).toEqual(["Ada", "Bo"]);
  });

  it("loads once for concurrent readers of the same key", async () => {
    const [a, b, c] = await Promise.all([names(), names(), names()]);
    expect(a).toEqual(["Ada"]);
    expect(b).toBe(a);
    expect(c).toBe(a);
    expect(loads).toBe(1);
  });

  it("hands out frozen answers, so one caller cannot change another's", async () => {
    const list = await names();
    expect(Object.isFrozen(list)).toBe(true);
    expect(() => (list as string[]).push("Eve")).toThrow(TypeError);
  });

  it("passes the tables of a nested read on to the read that contains it", async () => {
    const outer = () => cache.read("outer", async () => ({ names: await names(), at: loads }));
    await outer();
    await client.query(`insert into "people" values (2, 'Bo')`);
    expect((await outer()).names).toEqual(["Ada", "Bo"]);
  });

  it("keeps an answer through an UPDATE of columns its SQL does not name, and drops it when it names one", async () => {
    await names();
    await client.query(`update "people" set "note" = 'visited' where "id" = 1`);
    expect(await names()).toEqual(["Ada"]);
    expect(loads).toBe(1);
    // The column in a condition or a count's filter counts as much as in the select list.
    const counted = () => cache.read("counted", async () => (await client.query<{ n: number }>(`select count(*)::int as n from "people" where "note" is null`)).rows[0]!.n);
    expect(await counted()).toBe(0);
    await client.query(`update "people" set "name" = 'Ada L.'`);
    expect(await names()).toEqual(["Ada L."]);
    expect(loads).toBe(2);
    expect(await counted()).toBe(0); // name is not in its SQL: still the answer from before
    await client.query(`update "people" set "note" = null`);
    expect(await counted()).toBe(1);
  });

  it("counts a read that may take whole rows as depending on every column", async () => {
    const star = () => cache.read("star", async () => (await client.query<{ note: string | null }>(`select * from "people"`)).rows.map((r) => r.note));
    const aggregated = () => cache.read("aggregated", async () => (await client.query<{ rows: unknown }>(`select json_agg(p) as rows from "people" p`)).rows[0]!.rows);
    expect(await star()).toEqual([null]);
    expect(await aggregated()).toEqual([{ id: 1, name: "Ada", note: null }]);
    await client.query(`update "people" set "note" = 'visited'`);
    expect(await star()).toEqual(["visited"]);
    expect(await aggregated()).toEqual([{ id: 1, name: "Ada", note: "visited" }]);
  });

  it("passes the columns of a nested read on to the read that contains it", async () => {
    let outerLoads = 0;
    const outer = () =>
      cache.read("outer-columns", async () => {
        outerLoads += 1;
        return { names: await names(), pets: (await client.query<{ id: number }>(`select "id" from "pets"`)).rows.length };
      });
    await names(); // already remembered when the outer read takes it
    await outer();
    await client.query(`update "people" set "note" = 'visited'`); // named by neither
    await outer();
    expect([loads, outerLoads]).toEqual([1, 1]);
    await client.query(`update "people" set "name" = 'Ada L.'`); // named only by the inner read
    expect((await outer()).names).toEqual(["Ada L."]);
    expect([loads, outerLoads]).toEqual([2, 2]);
  });

  it("keeps a bounded number of answers", async () => {
    for (let i = 0; i < 2_100; i++) await cache.read(`bounded-${i}`, async () => i);
    expect(cache.stats().entries).toBe(2_000);
  });
});

describe("what the cache's column rule stands on", () => {
  // An UPDATE is taken to change only the columns it assigns. That stops holding the day the schema
  // gets a generated column, a foreign key that cascades on update, a view, a rule, or a trigger that
  // writes: this fails then, so the rule is looked at again before the cache can serve a stale answer.
  const migrations = fs
    .readdirSync(path.join(ROOT, "drizzle"))
    .filter((f) => f.endsWith(".sql"))
    .map((f) => ({ file: f, sql: fs.readFileSync(path.join(ROOT, "drizzle", f), "utf8") }));

  it("reads the migrations", () => {
    expect(migrations.length).toBeGreaterThan(5);
  });

  it("has no generated column, ON UPDATE action, view or rule", () => {
    for (const { file, sql } of migrations) {
      expect(sql, file).not.toMatch(/\bgenerated\s+always\b/i);
      expect(sql, file).not.toMatch(/\bon\s+update\s+(cascade|set\s+null|set\s+default)\b/i);
      expect(sql, file).not.toMatch(/\bcreate\s+(or\s+replace\s+)?(materialized\s+)?(view|rule)\b/i);
    }
  });

  it("has triggers only to refuse changes: no trigger function writes", () => {
    let bodies = 0;
    for (const { file, sql } of migrations) {
      for (const m of sql.matchAll(/create\s+(?:or\s+replace\s+)?function[\s\S]*?\$\$([\s\S]*?)\$\$/gi)) {
        bodies += 1;
        expect(m[1], file).not.toMatch(/\b(insert\s+into|update\s+\S+\s+set|delete\s+from|truncate)\b/i);
        expect(m[1], file).toMatch(/\braise\s+exception\b/i);
      }
    }
    expect(bodies).toBeGreaterThan(0);
  });
});
