import { afterEach, describe, expect, it, vi } from "vitest";
import { SECURE_SESSION_COOKIE, SESSION_COOKIE, sessionCookieName, sessionIsCurrent } from "@/lib/auth/session";

afterEach(() => vi.unstubAllEnvs());

describe("session cookie", () => {
  it("carries the __Host- prefix when served over HTTPS (production), and not on the plain-HTTP demo", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("AIRTALLY_DEMO", "");
    expect(sessionCookieName()).toBe(SECURE_SESSION_COOKIE);
    expect(SECURE_SESSION_COOKIE).toBe("__Host-airtally_session");
    vi.stubEnv("AIRTALLY_DEMO", "1");
    expect(sessionCookieName()).toBe(SESSION_COOKIE);
  });

  it("is current only for the user's present session version (cookies from before versions count as 1)", () => {
    expect(sessionIsCurrent({ userId: "u", sv: 3 }, 3)).toBe(true);
    expect(sessionIsCurrent({ userId: "u", sv: 2 }, 3)).toBe(false);
    expect(sessionIsCurrent({ userId: "u" }, 1)).toBe(true);
    expect(sessionIsCurrent({ userId: "u" }, 2)).toBe(false);
  });
});
