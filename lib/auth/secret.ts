import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { demoMode } from "@/db/client";

export const SECRET_ENV = "AIRTALLY_SESSION_SECRET";
const MIN_LENGTH = 32;

export class MissingSecretError extends Error {
  constructor(detail: string) {
    super(
      `${detail} Set ${SECRET_ENV} to a random string of at least ${MIN_LENGTH} characters, ` +
        `for example: export ${SECRET_ENV}="$(openssl rand -base64 48)"`,
    );
  }
}

/** Demo and development runs may keep a generated secret beside their data; production must be given one. */
export function mayGenerateSecret(): boolean {
  return demoMode() || process.env.NODE_ENV !== "production";
}

/**
 * The cookie-sealing secret: from the environment, or (demo and development only) generated
 * once into the data directory so sessions survive a restart.
 */
export function resolveSessionSecret(dataDir: string): string {
  const fromEnv = process.env[SECRET_ENV];
  if (fromEnv !== undefined && fromEnv !== "") {
    if (fromEnv.length < MIN_LENGTH) throw new MissingSecretError(`${SECRET_ENV} is only ${fromEnv.length} characters long.`);
    return fromEnv;
  }
  if (!mayGenerateSecret()) throw new MissingSecretError(`${SECRET_ENV} is not set, and a production server will not start without it.`);
  const dir = dataDir.startsWith("memory://") ? path.join(process.cwd(), ".data") : dataDir;
  const file = path.join(dir, "session-secret");
  if (fs.existsSync(file)) return fs.readFileSync(file, "utf8").trim();
  fs.mkdirSync(dir, { recursive: true });
  const secret = crypto.randomBytes(48).toString("base64url");
  fs.writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}
