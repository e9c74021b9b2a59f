import { describe, expect, it } from "vitest";
import { launcherEnv } from "@/lib/cli/launcher-env";

describe("the launcher's environment for the server", () => {
  it("never passes demo mode to a production start, even when the shell has it", () => {
    const env = launcherEnv({ demo: false, port: 4000, env: { AIRTALLY_DEMO: "1", PATH: "/bin" } });
    expect(env.AIRTALLY_DEMO).toBeUndefined();
    expect(env.NODE_ENV).toBe("production");
    expect(env.PATH).toBe("/bin");
  });

  it("sets demo mode for the demo and a public URL for links unless one is given", () => {
    expect(launcherEnv({ demo: true, port: 4000, env: {} })).toMatchObject({ AIRTALLY_DEMO: "1", AIRTALLY_PUBLIC_URL: "http://localhost:4000", PORT: "4000" });
    expect(launcherEnv({ demo: false, port: 4000, env: { AIRTALLY_PUBLIC_URL: "https://tab.example.test" } }).AIRTALLY_PUBLIC_URL).toBe("https://tab.example.test");
  });
});
