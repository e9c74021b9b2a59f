/**
 * The device side of the offline module that no page needs to draw itself: IndexedDB (through idb),
 * the queue that sends records, its transport and backoff. OfflineProvider fetches this after the
 * page is up; what is typed meanwhile is held by useOfflineDraft and applied in order once the
 * queue is open, as it always was while IndexedDB opened.
 */
import { openDraftStore } from "./draft-store";
import { browserNetwork, SyncQueue } from "./sync-queue";

/** Opens the device store and starts a queue on it for `owner`; `close` ends both. */
export async function openSyncQueue(owner: string, isCancelled: () => boolean): Promise<{ queue: SyncQueue; close: () => void } | null> {
  const store = await openDraftStore();
  if (isCancelled()) {
    store.close();
    return null;
  }
  const queue = new SyncQueue({ store, owner, network: browserNetwork() });
  await queue.start();
  return {
    queue,
    close: () => {
      queue.stop();
      store.close();
    },
  };
}
