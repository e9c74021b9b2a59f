import "server-only";
import { getIronSession, type SessionOptions } from "iron-session";
import { cookies } from "next/headers";
import { defaultDataDir, demoMode } from "@/db/client";
import { resolveSessionSecret } from "./secret";

export interface SessionData {
  userId?: string;
}

export const SESSION_COOKIE = "airtally_session";

let options: SessionOptions | undefined;

function sessionOptions(): SessionOptions {
  options ??= {
    cookieName: SESSION_COOKIE,
    password: resolveSessionSecret(defaultDataDir()),
    ttl: 60 * 60 * 12, // a working day on site
    cookieOptions: {
      httpOnly: true,
      sameSite: "lax",
      // Production is served over HTTPS; the demo runs a production build on plain http://localhost.
      secure: process.env.NODE_ENV === "production" && !demoMode(),
      path: "/",
    },
  };
  return options;
}

export async function getSession() {
  return getIronSession<SessionData>(await cookies(), sessionOptions());
}
