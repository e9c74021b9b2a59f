import { NextRequest } from "next/server";
import { afterEach, describe, expect, it, vi } from "vitest";
import { proxy } from "@/proxy";

afterEach(() => vi.unstubAllEnvs());

describe("proxy.ts headers", () => {
  it("sends HSTS and upgrades insecure requests in production over HTTPS", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("AIRTALLY_DEMO", "");
    const res = proxy(new NextRequest("https://airtally.example.test/projects"));
    expect(res.headers.get("strict-transport-security")).toBe("max-age=63072000; includeSubDomains");
    expect(res.headers.get("content-security-policy")).toContain("upgrade-insecure-requests");
  });

  it("leaves both out for the demo on plain HTTP, and allows eval only in development", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("AIRTALLY_DEMO", "1");
    const demo = proxy(new NextRequest("http://localhost/projects"));
    expect(demo.headers.get("strict-transport-security")).toBeNull();
    expect(demo.headers.get("content-security-policy")).not.toContain("unsafe-eval");
    vi.stubEnv("NODE_ENV", "development");
    expect(proxy(new NextRequest("http://localhost/")).headers.get("content-security-policy")).toContain("'unsafe-eval'");
  });
});
