import type * as SessionModule from "@/lib/auth/session";

/**
 * A stand-in for the session cookie in route tests: the signed-in user is whoever `auth.userId`
 * names at the moment of the call; everything after the session (version check, roles, queries) is
 * the real code. Use it as
 *   const auth = vi.hoisted(() => ({ userId: undefined as string | undefined }));
 *   vi.mock("@/lib/auth/session", async (original) => (await import("../support/session-mock")).mockSession(await original(), auth));
 */
export function mockSession(original: typeof SessionModule, auth: { userId?: string }): typeof SessionModule {
  return {
    ...original,
    getSession: (async () => ({ userId: auth.userId, save: async () => undefined, destroy: () => undefined })) as unknown as typeof SessionModule.getSession,
    readSession: async () => (auth.userId ? { userId: auth.userId } : {}),
  };
}
