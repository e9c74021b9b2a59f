import "server-only";
import { eq, sql } from "drizzle-orm";
import { cachedRead, getDb, type Frozen } from "../client";
import { users } from "../schema";

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
  unitSystem: "IP" | "SI" | null;
  /** Compared with the version sealed in the session cookie: a mismatch means the session was revoked. */
  sessionVersion: number;
}

/** The columns of a SessionUser, for every query that reads one. */
export const sessionColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  isAdmin: users.isAdmin,
  unitSystem: users.unitSystem,
  sessionVersion: users.sessionVersion,
};

/** The session's user: asked on every request, so remembered until the users table is written. */
export async function getUserById({ id }: { id: string }): Promise<Frozen<SessionUser> | null> {
  return cachedRead(`user:${id}`, async () => {
    const db = await getDb();
    const [row] = await db.select(sessionColumns).from(users).where(eq(users.id, id));
    return row ?? null;
  });
}

/** The user and password hash for sign-in; e-mail matching ignores case. */
export async function getUserForSignIn({ email }: { email: string }) {
  const db = await getDb();
  const [row] = await db
    .select({ ...sessionColumns, passwordHash: users.passwordHash })
    .from(users)
    .where(eq(sql`lower(${users.email})`, email.trim().toLowerCase()));
  return row ?? null;
}

export async function getPasswordHash({ id }: { id: string }): Promise<string | null> {
  const db = await getDb();
  const [row] = await db.select({ hash: users.passwordHash }).from(users).where(eq(users.id, id));
  return row?.hash ?? null;
}

export async function setUserUnitSystem({ id, unitSystem }: { id: string; unitSystem: "IP" | "SI" | null }): Promise<SessionUser | null> {
  const db = await getDb();
  const [row] = await db.update(users).set({ unitSystem }).where(eq(users.id, id)).returning(sessionColumns);
  return row ?? null;
}

/** Ends every session of the user: the version sealed in their cookies no longer matches. Returns the new version. */
export async function bumpSessionVersion({ id }: { id: string }): Promise<number | null> {
  const db = await getDb();
  const [row] = await db
    .update(users)
    .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(eq(users.id, id))
    .returning({ v: users.sessionVersion });
  return row?.v ?? null;
}

/** A new password hash, and every existing session ended in the same statement. Returns the new session version. */
export async function setUserPassword({ id, passwordHash }: { id: string; passwordHash: string }): Promise<number | null> {
  const db = await getDb();
  const [row] = await db
    .update(users)
    .set({ passwordHash, sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(eq(users.id, id))
    .returning({ v: users.sessionVersion });
  return row?.v ?? null;
}
