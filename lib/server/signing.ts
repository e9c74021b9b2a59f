/**
 * The deployment's Ed25519 key, which signs the exact bytes of every issued report. It is given as
 * AIRTALLY_SIGNING_KEY (a PKCS#8 PEM private key) or created in the data directory on first use
 * (`signing-key.pem`, readable by the owner only). An in-memory database gets a key for the life of
 * the process: nothing it issues outlives it anyway.
 */
import crypto, { type KeyObject } from "node:crypto";
import fs from "node:fs";
import path from "node:path";

export const SIGNING_KEY_ENV = "AIRTALLY_SIGNING_KEY";
const KEY_FILE = "signing-key.pem";

export interface SigningKey {
  privateKey: KeyObject;
  publicKey: KeyObject;
  /** SubjectPublicKeyInfo PEM: what `openssl pkeyutl -verify -pubin -inkey` reads. */
  publicKeyPem: string;
  /** First 16 hex digits of the SHA-256 of the public key (DER): names the key on screens and in reports. */
  keyId: string;
}

export class SigningKeyError extends Error {}

function fromPrivatePem(pem: string, where: string): SigningKey {
  let privateKey: KeyObject;
  try {
    privateKey = crypto.createPrivateKey(pem);
  } catch {
    throw new SigningKeyError(`${where} is not a PEM private key. Make one with: openssl genpkey -algorithm ed25519`);
  }
  if (privateKey.asymmetricKeyType !== "ed25519") {
    throw new SigningKeyError(`${where} is a ${privateKey.asymmetricKeyType} key; Airtally signs reports with Ed25519 (openssl genpkey -algorithm ed25519).`);
  }
  const publicKey = crypto.createPublicKey(privateKey);
  const publicKeyPem = publicKey.export({ type: "spki", format: "pem" }).toString();
  const der = publicKey.export({ type: "spki", format: "der" });
  return { privateKey, publicKey, publicKeyPem, keyId: crypto.createHash("sha256").update(der).digest("hex").slice(0, 16) };
}

function newPrivatePem(): string {
  const { privateKey } = crypto.generateKeyPairSync("ed25519");
  return privateKey.export({ type: "pkcs8", format: "pem" }).toString();
}

/** Reads the key file, creating it (mode 0600) when missing; two processes racing to create it agree on one. */
export function loadOrCreateKeyFile(dataDir: string): SigningKey {
  const file = path.join(/*turbopackIgnore: true*/ dataDir, KEY_FILE);
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true });
    try {
      fs.writeFileSync(file, newPrivatePem(), { mode: 0o600, flag: "wx" });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== "EEXIST") throw err;
    }
  }
  const mode = fs.statSync(file).mode & 0o777;
  if (mode & 0o077) console.warn(`[signing] ${file} is readable by others (mode ${mode.toString(8)}); run: chmod 600 ${file}`);
  return fromPrivatePem(fs.readFileSync(file, "utf8"), file);
}

const globalForKey = globalThis as unknown as { airtallySigningKey?: { source: string; key: SigningKey } };

/** The process's signing key, read once per source. */
export function getSigningKey(): SigningKey {
  const fromEnv = process.env[SIGNING_KEY_ENV]?.trim();
  const dataDir = process.env.AIRTALLY_DATA_DIR || path.join(/*turbopackIgnore: true*/ process.cwd(), ".data");
  const source = fromEnv ? `env:${fromEnv}` : dataDir.startsWith("memory://") ? "memory" : `file:${path.resolve(/*turbopackIgnore: true*/ dataDir)}`;
  if (globalForKey.airtallySigningKey?.source === source) return globalForKey.airtallySigningKey.key;
  const key = fromEnv
    ? fromPrivatePem(fromEnv.replace(/\\n/g, "\n"), SIGNING_KEY_ENV)
    : source === "memory"
      ? fromPrivatePem(newPrivatePem(), "the in-memory key")
      : loadOrCreateKeyFile(dataDir);
  globalForKey.airtallySigningKey = { source, key };
  return key;
}

/** Ed25519 signature (64 bytes) over exactly these bytes. */
export function signBytes(bytes: Uint8Array, key: SigningKey = getSigningKey()): Buffer {
  return crypto.sign(null, bytes, key.privateKey);
}

/** Whether a signature over these bytes checks with a public key given as PEM. */
export function verifyBytes(bytes: Uint8Array, signature: Uint8Array, publicKeyPem: string): boolean {
  try {
    return crypto.verify(null, bytes, crypto.createPublicKey(publicKeyPem), signature);
  } catch {
    return false;
  }
}

export function sha256Hex(bytes: Uint8Array): string {
  return crypto.createHash("sha256").update(bytes).digest("hex");
}
