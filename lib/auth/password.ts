import { hash, verify } from "@node-rs/argon2";

// Argon2id with the library's defaults (19 MiB, 2 passes): the current OWASP minimum.
export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

// A real hash to verify against when the e-mail is unknown, so a wrong e-mail and a
// wrong password take the same time and cannot be told apart.
let decoy: Promise<string> | undefined;

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
  if (passwordHash === null) {
    decoy ??= hash("airtally-decoy-password");
    await verify(await decoy, password).catch(() => false);
    return false;
  }
  return verify(passwordHash, password).catch(() => false);
}
