/**
 * Retry delays after a failed send: exponential, capped, with jitter so a crew's tablets coming back
 * online together do not all knock at once. Never gives up (entries are never dropped); only the wait
 * between tries is bounded.
 */

export interface BackoffOptions {
  /** Delay after the first failure. */
  baseMs: number;
  /** Growth per further failure. */
  factor: number;
  /** The longest wait between two tries. */
  maxMs: number;
  /** ± fraction of the delay drawn at random (0 = none). */
  jitter: number;
}

/** 2 s, 4 s, 8 s … up to one minute, ±20 % (our choice: quick after a blip, gentle on a dead line). */
export const DEFAULT_BACKOFF: Readonly<BackoffOptions> = { baseMs: 2_000, factor: 2, maxMs: 60_000, jitter: 0.2 };

/**
 * The wait before try number `attempt + 1`, after `attempt` failures (1, 2, …). Always within
 * [baseMs·(1 − jitter), maxMs]. `random` returns [0, 1).
 */
export function retryDelayMs(attempt: number, options: BackoffOptions = DEFAULT_BACKOFF, random: () => number = Math.random): number {
  const n = Math.max(1, Math.floor(attempt));
  // Cap the exponent before it overflows: factor^n beyond maxMs is maxMs anyway.
  const raw = Math.min(options.maxMs, options.baseMs * Math.pow(options.factor, Math.min(n - 1, 60)));
  const spread = 1 - options.jitter + 2 * options.jitter * Math.min(Math.max(random(), 0), 1);
  return Math.round(Math.min(options.maxMs, raw * spread));
}
