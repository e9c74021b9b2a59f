import { AsyncLocalStorage } from "node:async_hooks";
import type { PGlite, Transaction } from "@electric-sql/pglite";

/**
 * Answers to repeated reads, kept in the process while nothing they read has been written.
 *
 * Only for the embedded database: the server process holds the data directory's lock, so every write
 * goes through the one PGlite instance this watches. (With PostgreSQL other servers may write, so
 * there is no cache: `readThrough` on a handle without one simply loads.)
 *
 * How a stale answer is ruled out:
 * - every statement the instance runs is seen here. A SELECT is a read; an INSERT marks its table
 *   written; an UPDATE whose SET list can be read marks only the columns it assigns in its table
 *   (otherwise the whole table); a DELETE (foreign keys may cascade), a multi-statement `exec`, or
 *   anything not recognised marks every table written;
 * - while a read is being loaded, the tables its statements name are collected (any known table name
 *   appearing in the SQL counts, so a subquery or a column that happens to share a name only makes the
 *   answer depend on more, never on less), and so is every word of its SQL. An UPDATE changes no row's
 *   existence, only the values of the columns it assigns, so it can change an answer only if the
 *   answer's SQL names one of those columns (in its select list, a condition, a join or an order) or
 *   takes whole rows (`*`, or a JSON or array aggregate, which may be given a row): anything else
 *   counts as depending on every column. The schema has no generated columns, no ON UPDATE cascades
 *   and no triggers that write, which is what makes this hold;
 * - an answer is kept with the write counter as it stood *before* its first statement ran, and is
 *   served only while none of its tables has been written since. A write that lands while the read is
 *   running therefore always invalidates it, committed or not.
 * Answers are deep-frozen (callers share them) and the number kept is bounded.
 */

const MAX_ENTRIES = 2_000;

/** What a load read: tables, and the words of its SQL (null: it may depend on any column). */
interface Footprint {
  tables: Set<string>;
  words: Set<string> | null;
}

interface Entry {
  value: unknown;
  tables: readonly string[];
  words: ReadonlySet<string> | null;
  /** The write counter before the first statement of the load ran. */
  since: number;
}

interface Flight {
  promise: Promise<Entry>;
  since: number;
}

export interface ReadCacheStats {
  hits: number;
  misses: number;
  entries: number;
}

/** Statements that neither read nor write a table: transaction control and session settings. */
const NEUTRAL = /^(begin|start\s+transaction|commit|end|rollback|savepoint|release|set|show|reset|listen|unlisten|discard|deallocate)\b/i;
/** Functions a SELECT may call that change state. */
const SIDE_EFFECTS = /\b(nextval|setval|pg_advisory\w*|set_config|lo_\w+|pg_notify|pg_terminate_backend|pg_cancel_backend)\s*\(/i;
const TARGET = /^(insert\s+into|update)\s+(?:only\s+)?(?:"?public"?\s*\.\s*)?"?([a-z_][a-z0-9_]*)"?/i;

function stripLeadingComments(text: string): string {
  let s = text.trimStart();
  for (;;) {
    if (s.startsWith("--")) s = s.slice(s.indexOf("\n") + 1 || s.length).trimStart();
    else if (s.startsWith("/*")) s = s.slice(s.indexOf("*/") + 2 || s.length).trimStart();
    else return s;
  }
}

export type StatementEffect =
  | { kind: "read" }
  | { kind: "none" }
  | { kind: "write"; table: string }
  | { kind: "update"; table: string; columns: string[] }
  | { kind: "write-all" };

/** Reads that may take whole rows, so their SQL need not name the columns they depend on. */
const WHOLE_ROWS = /\*|\b(row_to_json|to_jsonb?|json_agg|jsonb_agg|json_object_agg|jsonb_object_agg|array_agg|row)\s*\(/i;
const COUNT_STAR = /\bcount\s*\(\s*\*\s*\)/gi;
const WORD = /[a-z_][a-z0-9_$]*/gi;

/**
 * The columns an UPDATE's SET list assigns (`set "a" = …, b = …`), or null when it cannot be read
 * with certainty (a row assignment `(a, b) = …`, quoting it does not expect, and the like).
 */
function assignedColumns(afterSet: string): string[] | null {
  const columns: string[] = [];
  let depth = 0;
  let start = 0;
  let end = afterSet.length;
  for (let i = 0; i < afterSet.length; i++) {
    const c = afterSet[i]!;
    if (c === "'" || c === '"') {
      const close = afterSet.indexOf(c, i + 1);
      if (close < 0) return null;
      i = close;
    } else if (c === "(") depth += 1;
    else if (c === ")") depth -= 1;
    else if (depth === 0 && c === ",") {
      columns.push(afterSet.slice(start, i));
      start = i + 1;
    } else if (depth === 0 && /\s/.test(c) && /^\s+(where|returning|from)\b/i.test(afterSet.slice(i, i + 12))) {
      end = i;
      break;
    }
  }
  if (depth !== 0) return null;
  columns.push(afterSet.slice(start, end));
  const names: string[] = [];
  for (const assignment of columns) {
    const m = /^\s*(?:"([a-z_][a-z0-9_]*)"|([a-z_][a-z0-9_]*))\s*=/i.exec(assignment);
    if (!m) return null;
    names.push((m[1] ?? m[2]!).toLowerCase());
  }
  return names;
}

/** What one SQL statement may do to the tables, erring towards "wrote everything". */
export function statementEffect(sqlText: string): StatementEffect {
  const s = stripLeadingComments(sqlText);
  if (/^select\b/i.test(s)) return SIDE_EFFECTS.test(s) ? { kind: "write-all" } : { kind: "read" };
  if (NEUTRAL.test(s)) return { kind: "none" };
  const target = TARGET.exec(s);
  // A WITH can hide a data-modifying statement; a semicolon can hide a second one.
  if (!target || s.includes(";")) return { kind: "write-all" };
  const table = target[2]!.toLowerCase();
  if (/^update$/i.test(target[1]!)) {
    const set = /^\s*"?[a-z0-9_]*"?\s+set\s/i.exec(s.slice(target[0].length));
    const columns = set ? assignedColumns(s.slice(target[0].length + set[0].length)) : null;
    if (columns) return { kind: "update", table, columns };
  }
  return { kind: "write", table };
}

export class ReadCache {
  private counter = 0;
  private everythingWrittenAt = 0;
  private readonly writtenAt = new Map<string, number>();
  /** Per table: when each column was last assigned by an UPDATE, and the latest of those. */
  private readonly columnsWrittenAt = new Map<string, { latest: number; columns: Map<string, number> }>();
  private readonly entries = new Map<string, Entry>();
  private readonly flights = new Map<string, Flight>();
  private readonly loading = new AsyncLocalStorage<Footprint>();
  private readonly tableWord: RegExp;
  private hits = 0;
  private misses = 0;

  constructor(tableNames: readonly string[]) {
    const names = [...tableNames].sort((a, b) => b.length - a.length).map((n) => n.replace(/[^a-z0-9_]/gi, ""));
    this.tableWord = new RegExp(`(?<![a-z0-9_])(${names.join("|")})(?![a-z0-9_])`, "gi");
  }

  /** Called for every statement the database runs (see watchPglite); true when it may write. */
  observe(sqlText: string): boolean {
    const effect = statementEffect(sqlText);
    if (effect.kind === "read") {
      const footprint = this.loading.getStore();
      if (footprint) {
        for (const m of sqlText.matchAll(this.tableWord)) footprint.tables.add(m[1]!.toLowerCase());
        if (footprint.words && WHOLE_ROWS.test(sqlText.replace(COUNT_STAR, "count()"))) footprint.words = null;
        if (footprint.words) for (const m of sqlText.matchAll(WORD)) footprint.words.add(m[0].toLowerCase());
      }
      return false;
    }
    if (effect.kind === "none") return false;
    this.counter += 1;
    if (effect.kind === "write") this.writtenAt.set(effect.table, this.counter);
    else if (effect.kind === "update") {
      let written = this.columnsWrittenAt.get(effect.table);
      if (!written) this.columnsWrittenAt.set(effect.table, (written = { latest: 0, columns: new Map() }));
      written.latest = this.counter;
      for (const c of effect.columns) written.columns.set(c, this.counter);
    } else this.everythingWrittenAt = this.counter;
    return true;
  }

  /** Marks every table written (a statement ran that could not be inspected). */
  invalidateAll(): void {
    this.counter += 1;
    this.everythingWrittenAt = this.counter;
  }

  private fresh({ tables, words }: Pick<Entry, "tables" | "words">, since: number): boolean {
    if (this.everythingWrittenAt > since) return false;
    for (const t of tables) {
      if ((this.writtenAt.get(t) ?? 0) > since) return false;
      const updated = this.columnsWrittenAt.get(t);
      if (updated && updated.latest > since) {
        if (!words) return false;
        for (const [column, at] of updated.columns) if (at > since && words.has(column)) return false;
      }
    }
    return true;
  }

  /** The remembered answer for `key`, or `load()`'s, remembered until a table it read is written. */
  async read<T>(key: string, load: () => Promise<T>): Promise<T> {
    const outer = this.loading.getStore();
    const entry = this.entries.get(key);
    if (entry && this.fresh(entry, entry.since)) {
      this.hits += 1;
      // Refresh its place in the least-recently-used order.
      this.entries.delete(key);
      this.entries.set(key, entry);
      if (outer) include(outer, entry);
      return entry.value as T;
    }
    this.misses += 1;
    // Join a load of the same key already under way, if nothing has been written since it began.
    let flight = this.flights.get(key);
    if (!flight || flight.since !== this.counter) {
      const since = this.counter;
      const footprint: Footprint = { tables: new Set(), words: new Set() };
      const promise = this.loading.run(footprint, load).then((value) => {
        const loaded: Entry = { value: deepFreeze(value), tables: [...footprint.tables], words: footprint.words, since };
        if (this.fresh(loaded, since)) this.remember(key, loaded);
        return loaded;
      });
      flight = { promise, since };
      this.flights.set(key, flight);
      const settled = () => {
        if (this.flights.get(key) === flight) this.flights.delete(key);
      };
      promise.then(settled, settled);
    }
    const loaded = await flight.promise;
    if (outer) include(outer, loaded);
    return loaded.value as T;
  }

  private remember(key: string, entry: Entry): void {
    this.entries.delete(key);
    this.entries.set(key, entry);
    if (this.entries.size > MAX_ENTRIES) this.entries.delete(this.entries.keys().next().value!);
  }

  stats(): ReadCacheStats {
    return { hits: this.hits, misses: this.misses, entries: this.entries.size };
  }
}

/** A read nested in another load makes the outer answer depend on what the inner one read. */
function include(outer: Footprint, inner: Pick<Entry, "tables" | "words">): void {
  for (const t of inner.tables) outer.tables.add(t);
  if (!inner.words) outer.words = null;
  else if (outer.words) for (const w of inner.words) outer.words.add(w);
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === "object" && !Object.isFrozen(value) && !(value instanceof Date) && !ArrayBuffer.isView(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

type Queryable = Pick<PGlite, "query" | "exec"> & { sql?: unknown };

function watchQueries<C extends Queryable>(client: C, cache: ReadCache): C {
  const query = client.query.bind(client) as (...a: unknown[]) => ReturnType<PGlite["query"]>;
  const exec = client.exec.bind(client) as (...a: unknown[]) => ReturnType<PGlite["exec"]>;
  client.query = ((text: string, ...rest: unknown[]) => {
    const writes = cache.observe(text);
    const running = query(text, ...rest);
    return writes ? running.finally(() => cache.observe(text)) : running;
  }) as C["query"];
  client.exec = ((text: string, ...rest: unknown[]) => {
    // Several statements in one string: not worth inspecting one by one.
    cache.invalidateAll();
    return exec(text, ...rest).finally(() => cache.invalidateAll());
  }) as C["exec"];
  if (typeof client.sql === "function") {
    const tagged = (client.sql as (...a: unknown[]) => Promise<unknown>).bind(client);
    client.sql = (...args: unknown[]) => {
      cache.invalidateAll();
      return tagged(...args).finally(() => cache.invalidateAll());
    };
  }
  return client;
}

/**
 * Puts a read cache on an embedded database: every statement run through `client` (directly or in a
 * transaction) is seen by it. Writes are noted both before and after they run, so a read that starts
 * in between cannot keep what it saw.
 */
export function watchPglite(client: PGlite, tableNames: readonly string[]): ReadCache {
  const cache = new ReadCache(tableNames);
  const transaction = client.transaction.bind(client);
  watchQueries(client, cache);
  client.transaction = (<T>(callback: (tx: Transaction) => Promise<T>) => transaction((tx) => callback(watchQueries(tx, cache)))) as PGlite["transaction"];
  return cache;
}
