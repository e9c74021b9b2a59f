import "server-only";
import { eq, sql } from "drizzle-orm";
import { getDb } from "../client";
import { users } from "../schema";

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
  unitSystem: "IP" | "SI" | null;
}

const sessionColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  isAdmin: users.isAdmin,
  unitSystem: users.unitSystem,
};

export async function getUserById({ id }: { id: string }): Promise<SessionUser | null> {
  const db = await getDb();
  const [row] = await db.select(sessionColumns).from(users).where(eq(users.id, id));
  return row ?? null;
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

export async function setUserUnitSystem({ id, unitSystem }: { id: string; unitSystem: "IP" | "SI" | null }): Promise<SessionUser | null> {
  const db = await getDb();
  const [row] = await db.update(users).set({ unitSystem }).where(eq(users.id, id)).returning(sessionColumns);
  return row ?? null;
}
