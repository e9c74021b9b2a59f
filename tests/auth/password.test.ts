import { hash } from "@node-rs/argon2";
import { describe, expect, it } from "vitest";
import { HASH_CONCURRENCY, HASH_QUEUE, hashingLoad, PasswordHashingBusyError, verifyPassword } from "@/lib/auth/password";

describe("password hashing under a flood", () => {
  it("runs at most HASH_CONCURRENCY hashes at once, queues up to HASH_QUEUE, and turns the rest away", async () => {
    const stored = await hash("correct horse");
    let peak = 0;
    const timer = setInterval(() => (peak = Math.max(peak, hashingLoad().active)), 1);
    const n = HASH_QUEUE + HASH_CONCURRENCY + 10;
    const outcomes = await Promise.allSettled(Array.from({ length: n }, (_, i) => verifyPassword(stored, i === 0 ? "correct horse" : "wrong")));
    clearInterval(timer);
    const busy = outcomes.filter((o) => o.status === "rejected" && o.reason instanceof PasswordHashingBusyError);
    expect(busy.length).toBe(n - HASH_QUEUE - HASH_CONCURRENCY);
    expect(outcomes[0]).toEqual({ status: "fulfilled", value: true });
    expect(peak).toBeLessThanOrEqual(HASH_CONCURRENCY);
    expect(hashingLoad()).toEqual({ active: 0, pending: 0 });
  });
});
