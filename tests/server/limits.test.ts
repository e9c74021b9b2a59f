import { describe, expect, it } from "vitest";
import { overLimit, withSlot } from "@/lib/server/limits";
import { normaliseVerificationCode, newVerificationCode } from "@/lib/server/report-codes";

describe("limits for public and heavy routes", () => {
  it("counts calls per client in a window", () => {
    const client = `test-${Math.random()}`;
    for (let i = 0; i < 3; i++) expect(overLimit("t", client, 3, 60_000)).toBe(false);
    expect(overLimit("t", client, 3, 60_000)).toBe(true);
    expect(overLimit("t", `${client}-other`, 3, 60_000)).toBe(false);
  });

  it("runs at most N at once and answers busy to the rest", async () => {
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const first = withSlot("slot-test", 1, () => gate.then(() => "done"), () => "busy");
    expect(await withSlot("slot-test", 1, async () => "ran", () => "busy")).toBe("busy");
    release();
    expect(await first).toBe("done");
    expect(await withSlot("slot-test", 1, async () => "ran", () => "busy")).toBe("ran");
  });
});

describe("verification codes", () => {
  it("are 12 unambiguous characters in three groups, and typed codes are forgiven case, dashes and look-alikes", () => {
    const code = newVerificationCode();
    expect(code).toMatch(/^[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}$/);
    expect(normaliseVerificationCode(code.toLowerCase().replace(/-/g, " "))).toBe(code);
    expect(normaliseVerificationCode("7kq2-m9xd-4rtO")).toBe("7KQ2-M9XD-4RT0");
    expect(normaliseVerificationCode("too-short")).toBeNull();
    expect(normaliseVerificationCode("x".repeat(500))).toBeNull();
  });
});

describe("multipart uploads", () => {
  it("stop waiting for a body that never finishes", async () => {
    const { readMultipartFile } = await import("@/lib/server/multipart");
    const stalled = new ReadableStream<Uint8Array>({
      start(c) {
        c.enqueue(new TextEncoder().encode('--b\r\nContent-Disposition: form-data; name="file"; filename="a.jpg"\r\n\r\nabc'));
      },
    });
    const req = new Request("http://localhost/x", { method: "POST", body: stalled, headers: { "content-type": "multipart/form-data; boundary=b" }, duplex: "half" } as RequestInit);
    const result = await readMultipartFile(req, { maxFileBytes: 1000, limitWords: "1 kB", timeoutMs: 200 });
    expect(result).toMatchObject({ ok: false, status: 408 });
  });
});
