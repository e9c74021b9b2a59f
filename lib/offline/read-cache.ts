/**
 * Reading offline: a fetcher wrapped so that each successful answer is kept on the device (per user)
 * and, when the network is not there, the last kept answer is returned instead, marked as such.
 * Meant for TanStack Query `queryFn`s of lists a technician needs on site (instruments, conditions).
 */
import type { SyncQueue } from "./sync-queue";

export interface Cached<V> {
  data: V;
  /** True when the network failed and this is the copy kept on the device. */
  fromDevice: boolean;
  /** When the data was fetched (epoch ms). */
  fetchedAt: number;
}

/** Whether an error means "could not reach the server" (not a refusal by it). */
export type IsNetworkError = (error: unknown) => boolean;

export const isFetchFailure: IsNetworkError = (error) =>
  error instanceof TypeError || (typeof error === "object" && error !== null && (error as { status?: unknown }).status === 0);

export async function withDeviceCopy<V>(queue: SyncQueue | null, key: string, fetcher: () => Promise<V>, isNetworkError: IsNetworkError = isFetchFailure): Promise<Cached<V>> {
  try {
    const data = await fetcher();
    const fetchedAt = Date.now();
    await queue?.cachePut(key, { data, fetchedAt });
    return { data, fromDevice: false, fetchedAt };
  } catch (error) {
    if (!queue || !isNetworkError(error)) throw error;
    const kept = await queue.cacheGet<{ data: V; fetchedAt: number }>(key).catch(() => undefined);
    if (!kept) throw error;
    return { data: kept.value.data, fromDevice: true, fetchedAt: kept.value.fetchedAt };
  }
}
