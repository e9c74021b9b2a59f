import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "../client";
import { signInAttempts, type SignInOutcome } from "../schema";

/**
 * Sign-in throttling (common practice for password guessing: count per account and per address,
 * back off progressively instead of locking out). An attempt counts against a key when it failed or
 * is still being checked; beyond the free attempts within the window each further one must wait
 * twice as long as the last since the key's latest counted attempt, up to a ceiling, so the real user
 * is delayed by a minute at worst and never locked out.
 */
export const SIGN_IN_THROTTLE = {
  windowMinutes: 15,
  /** Free attempts for one e-mail from one address. */
  freePerEmailAndClient: 5,
  /** Free attempts for one e-mail from all addresses together (a spread-out guessing attack). */
  freePerEmail: 20,
  /** Free attempts from one address over all e-mails (one machine trying many accounts). */
  freePerClient: 50,
  maxDelaySeconds: 60,
  /** Attempts older than this are deleted. */
  keepHours: 24,
} as const;

interface KeyStats {
  n: number;
  /** Seconds since the key's latest counted attempt (database clock); null when none. */
  elapsed: number | null;
}

function waitFor(stats: KeyStats, free: number): number {
  if (stats.n < free || stats.elapsed === null) return 0;
  const delay = Math.min(2 ** (stats.n - free), SIGN_IN_THROTTLE.maxDelaySeconds);
  return Math.max(0, delay - stats.elapsed);
}

export interface AttemptTicket {
  id: number;
  /** Seconds to wait before trying again; 0 when this attempt may go ahead. */
  retryAfterSeconds: number;
}

/**
 * Records an attempt before the password is checked, atomically with the count it is judged by:
 * per-e-mail and per-address advisory locks serialise concurrent attempts on a PostgreSQL server
 * (PGlite runs one transaction at a time anyway), so a burst of parallel guesses counts in full.
 * The window is computed by the database's clock.
 */
export async function beginSignInAttempt({ email, client }: { email: string; client: string }): Promise<AttemptTicket> {
  const db = await getDb();
  const { windowMinutes, freePerEmailAndClient, freePerEmail, freePerClient } = SIGN_IN_THROTTLE;
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${"sign-in:email:" + email})), pg_advisory_xact_lock(hashtext(${"sign-in:client:" + client}))`);
    const counted = sql`${signInAttempts.outcome} in ('pending', 'failed')`;
    const isPair = sql`${signInAttempts.email} = ${email} and ${signInAttempts.client} = ${client}`;
    const isEmail = sql`${signInAttempts.email} = ${email}`;
    const isClient = sql`${signInAttempts.client} = ${client}`;
    const elapsed = (filter: ReturnType<typeof sql>) =>
      sql<number | null>`extract(epoch from now() - max(${signInAttempts.at}) filter (where ${filter}))::float8`;
    const [stats] = await tx
      .select({
        pairN: sql<number>`(count(*) filter (where ${isPair}))::int`,
        pairElapsed: elapsed(isPair),
        emailN: sql<number>`(count(*) filter (where ${isEmail}))::int`,
        emailElapsed: elapsed(isEmail),
        clientN: sql<number>`(count(*) filter (where ${isClient}))::int`,
        clientElapsed: elapsed(isClient),
      })
      .from(signInAttempts)
      .where(sql`(${isEmail} or ${isClient}) and ${counted} and ${signInAttempts.at} > now() - make_interval(mins => ${windowMinutes})`);
    const s = stats!;
    const wait = Math.max(
      waitFor({ n: s.pairN, elapsed: s.pairElapsed }, freePerEmailAndClient),
      waitFor({ n: s.emailN, elapsed: s.emailElapsed }, freePerEmail),
      waitFor({ n: s.clientN, elapsed: s.clientElapsed }, freePerClient),
    );
    const outcome: SignInOutcome = wait > 0 ? "throttled" : "pending";
    const [row] = await tx.insert(signInAttempts).values({ email, client, outcome }).returning({ id: signInAttempts.id });
    return { id: row!.id, retryAfterSeconds: Math.ceil(wait) };
  });
}

/** Settles an attempt once the password has been checked; a success clears the e-mail's earlier failures from this address. */
export async function finishSignInAttempt({ id, outcome }: { id: number; outcome: "failed" | "succeeded" }): Promise<void> {
  const db = await getDb();
  if (outcome === "failed") {
    await db.execute(sql`update ${signInAttempts} set outcome = 'failed' where id = ${id}`);
    return;
  }
  // The right password from this address: earlier failures of this pair stop counting.
  await db.execute(sql`
    update ${signInAttempts} a set outcome = case when a.id = ${id} then 'succeeded'::sign_in_outcome else 'cleared'::sign_in_outcome end
    from ${signInAttempts} me
    where me.id = ${id} and a.email = me.email and a.client = me.client and (a.id = ${id} or a.outcome = 'failed')`);
}

/** Deletes attempts older than the retention period; cheap on the `at` index, run after each sign-in. */
export async function pruneSignInAttempts(): Promise<void> {
  const db = await getDb();
  await db.execute(sql`delete from ${signInAttempts} where ${signInAttempts.at} < now() - make_interval(hours => ${SIGN_IN_THROTTLE.keepHours})`);
}
