import "server-only";
import { getIronSession, unsealData, type SessionOptions } from "iron-session";
import { cookies } from "next/headers";
import { defaultDataDir, demoMode } from "@/db/client";
import { resolveSessionSecret } from "./secret";

export interface SessionData {
  userId?: string;
  /** The user's session version at sign-in; the session is void once the user's version moves on. Absent in cookies sealed before versions existed (version 1). */
  sv?: number;
}

/** The cookie name over plain HTTP (the demo on localhost). */
export const SESSION_COOKIE = "airtally_session";
/**
 * Over HTTPS the name carries the `__Host-` prefix: browsers then accept the cookie only when it is
 * Secure, has Path=/ and no Domain, so a sibling subdomain cannot plant or overwrite it.
 */
export const SECURE_SESSION_COOKIE = `__Host-${SESSION_COOKIE}`;

/** Production is served over HTTPS; the demo runs a production build on plain http://localhost. */
export function servedOverHttps(): boolean {
  return process.env.NODE_ENV === "production" && !demoMode();
}

export function sessionCookieName(): string {
  return servedOverHttps() ? SECURE_SESSION_COOKIE : SESSION_COOKIE;
}

let options: SessionOptions | undefined;

export function sessionOptions(): SessionOptions {
  options ??= {
    cookieName: sessionCookieName(),
    password: resolveSessionSecret(defaultDataDir()),
    ttl: 60 * 60 * 12, // a working day on site
    cookieOptions: {
      httpOnly: true,
      sameSite: "lax",
      secure: servedOverHttps(),
      path: "/",
    },
  };
  return options;
}

export async function getSession() {
  return getIronSession<SessionData>(await cookies(), sessionOptions());
}

/**
 * Unsealed cookies, remembered briefly: unsealing derives a key (PBKDF2) and decrypts on every
 * request, which showed up in the load profile. A sealed value always opens to the same data, so
 * the only thing a cache could stretch is the cookie's own expiry, by at most UNSEAL_CACHE_MS;
 * revocation does not depend on it (the session version is compared with the user row each time).
 */
const UNSEAL_CACHE_MS = 30_000;
const UNSEAL_CACHE_SIZE = 5_000;
const unsealed = new Map<string, { data: SessionData; until: number }>();

/** The session of this request, for reading (sign-in and sign-out write through getSession). */
export async function readSession(): Promise<SessionData> {
  const opts = sessionOptions();
  const seal = (await cookies()).get(opts.cookieName)?.value;
  if (!seal) return {};
  const now = Date.now();
  const hit = unsealed.get(seal);
  if (hit && hit.until > now) return hit.data;
  const data = await unsealData<SessionData>(seal, { password: opts.password, ttl: opts.ttl });
  if (unsealed.size >= UNSEAL_CACHE_SIZE) unsealed.delete(unsealed.keys().next().value!);
  unsealed.set(seal, { data, until: now + UNSEAL_CACHE_MS });
  return data;
}

/** True when the session was sealed for the user's current session version. */
export function sessionIsCurrent(session: SessionData, userSessionVersion: number): boolean {
  return (session.sv ?? 1) === userSessionVersion;
}
