/** Test doubles for the offline module: a clock the test moves, a network it switches, a server with versions. */
import type { Clock, Network } from "@/lib/offline/types";

export class ManualClock implements Clock {
  t = Date.parse("2026-11-24T09:00:00Z");
  private id = 0;
  private readonly timers = new Map<number, { at: number; fn: () => void }>();
  now() {
    return this.t;
  }
  setTimeout(fn: () => void, ms: number) {
    const id = ++this.id;
    this.timers.set(id, { at: this.t + ms, fn });
    return id;
  }
  clearTimeout(handle: unknown) {
    this.timers.delete(handle as number);
  }
  pendingTimers() {
    return this.timers.size;
  }
  /** Moves time forward, firing each due timer in order and letting its promises settle. */
  async advance(ms: number, settle: () => Promise<void>) {
    const end = this.t + ms;
    for (;;) {
      const next = [...this.timers.entries()].filter(([, t]) => t.at <= end).sort((a, b) => a[1].at - b[1].at)[0];
      if (!next) break;
      this.timers.delete(next[0]);
      this.t = Math.max(this.t, next[1].at);
      next[1].fn();
      await settle();
    }
    this.t = end;
  }
}

export class SwitchableNetwork implements Network {
  private listeners = new Set<(online: boolean) => void>();
  constructor(public online = true) {}
  isOnline() {
    return this.online;
  }
  subscribe(fn: (online: boolean) => void) {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  }
  set(online: boolean) {
    this.online = online;
    for (const l of this.listeners) l(online);
  }
}

export interface Call {
  method: string;
  url: string;
  body: Record<string, unknown>;
  at: number;
}

/**
 * A versioned resource behind PUT (stale version → 409 with the current one), plus scripted failures:
 * "offline" throws as fetch does without a network, a number answers that status.
 */
export class FakeServer {
  readings: unknown = [[null, null]];
  version = 1;
  calls: Call[] = [];
  script: ("offline" | "lose-answer" | number)[] = [];
  created = new Map<string, unknown>();
  constructor(private readonly clock: ManualClock) {}

  fetch = async (url: string, init: RequestInit): Promise<Response> => {
    const body = JSON.parse(String(init.body)) as Record<string, unknown>;
    this.calls.push({ method: String(init.method), url, body, at: this.clock.now() });
    const step = this.script.shift();
    if (step === "offline") throw new TypeError("Failed to fetch");
    if (typeof step === "number") return json(step, { error: { message: `Scripted ${step}.`, ...(step === 400 ? { fields: { "readings.0.1": "must be a number" } } : {}) } });
    if (init.method === "POST") {
      const id = String(body.id);
      const existing = this.created.get(id);
      if (!existing) this.created.set(id, body);
      if (step === "lose-answer") throw new TypeError("Failed to fetch");
      return json(existing ? 200 : 201, { conditions: existing ?? body });
    }
    if (body.version !== this.version) return json(409, { error: { message: "Someone else saved this traverse first." }, traverse: this.resource() });
    this.readings = body.readings;
    this.version += 1;
    if (step === "lose-answer") throw new TypeError("Failed to fetch");
    return json(200, { traverse: this.resource() });
  };

  resource() {
    return { id: "t1", version: this.version, readings: this.readings };
  }
}

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { "content-type": "application/json" } });
}
