import { hash, verify } from "@node-rs/argon2";
import pLimit from "p-limit";

/**
 * Argon2id with the library's defaults (19 MiB, 2 passes): the current OWASP minimum. Each hash
 * holds 19 MiB and a thread of libuv's pool while it runs, so at most HASH_CONCURRENCY run at once
 * and at most HASH_QUEUE wait; beyond that the caller is told the server is busy (a flood of
 * sign-ins cannot exhaust memory or threads, nor starve the database reads on the same pool).
 */
export const HASH_CONCURRENCY = 2;
export const HASH_QUEUE = 64;

const limit = pLimit(HASH_CONCURRENCY);

export class PasswordHashingBusyError extends Error {
  constructor() {
    super("Too many sign-ins are being checked right now; try again in a few seconds.");
  }
}

function limited<T>(work: () => Promise<T>): Promise<T> {
  if (limit.pendingCount >= HASH_QUEUE) return Promise.reject(new PasswordHashingBusyError());
  return limit(work);
}

/** How many hashes are running and waiting (for tests and diagnostics). */
export function hashingLoad(): { active: number; pending: number } {
  return { active: limit.activeCount, pending: limit.pendingCount };
}

export function hashPassword(password: string): Promise<string> {
  return limited(() => hash(password));
}

// A real hash to verify against when the e-mail is unknown, so a wrong e-mail and a
// wrong password take the same time and cannot be told apart.
let decoy: Promise<string> | undefined;

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
  if (passwordHash === null) {
    decoy ??= hash("airtally-decoy-password");
    const decoyHash = await decoy;
    await limited(() => verify(decoyHash, password).catch(() => false));
    return false;
  }
  return limited(() => verify(passwordHash, password).catch(() => false));
}
