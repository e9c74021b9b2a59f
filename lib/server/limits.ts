/**
 * Two small guards for expensive or public routes, per server process: a cap on how many run at
 * once (memory stays bounded however many arrive), and a fixed-window count per client address
 * (`clientAddress` from ./request, the same address sign-in throttling counts).
 */
const running = new Map<string, number>();

/** Runs `work` if fewer than `max` of `name` are running, else answers `busy()` at once. */
export async function withSlot<T>(name: string, max: number, work: () => Promise<T>, busy: () => T): Promise<T> {
  const now = running.get(name) ?? 0;
  if (now >= max) return busy();
  running.set(name, now + 1);
  try {
    return await work();
  } finally {
    running.set(name, (running.get(name) ?? 1) - 1);
  }
}

const windows = new Map<string, { start: number; count: number }>();
const MAX_TRACKED = 10_000;

/** True when this client has made more than `limit` calls to `name` in the current window. */
export function overLimit(name: string, client: string, limit: number, windowMs: number): boolean {
  const key = `${name}\u0000${client}`;
  const now = Date.now();
  let w = windows.get(key);
  if (!w || now - w.start >= windowMs) {
    if (windows.size >= MAX_TRACKED) windows.clear(); // bounded memory; a cleared window only forgives
    w = { start: now, count: 0 };
    windows.set(key, w);
  }
  w.count += 1;
  return w.count > limit;
}
