// @vitest-environment happy-dom
import "fake-indexeddb/auto";
import { act, cleanup, renderHook, waitFor } from "@testing-library/react";
import { createElement, type ReactNode } from "react";
import { afterEach, describe, expect, it } from "vitest";
import { IdbDraftStore } from "@/lib/offline/draft-store";
import { OfflineQueueProvider } from "@/lib/offline/offline-context";
import { SyncQueue } from "@/lib/offline/sync-queue";
import type { SyncRequest } from "@/lib/offline/types";
import { useOfflineDraft } from "@/lib/offline/use-offline-draft";
import { FakeServer, ManualClock, SwitchableNetwork } from "./support";

type Grid = (number | null)[][];
interface Traverse {
  id: string;
  version: number;
  readings: Grid;
}

let n = 0;
const queues: SyncQueue[] = [];
afterEach(() => {
  cleanup();
  for (const q of queues.splice(0)) q.stop();
});

async function setup(options: { online?: boolean; dbName?: string } = {}) {
  const clock = new ManualClock();
  clock.t = Date.now();
  const server = new FakeServer(clock);
  const network = new SwitchableNetwork(options.online ?? true);
  const dbName = options.dbName ?? `hook-test-${++n}`;
  const make = async () => {
    const q = new SyncQueue({ store: await IdbDraftStore.open(dbName), owner: "tech", fetch: server.fetch, network, debounceMs: 0 });
    queues.push(q);
    await q.start();
    return q;
  };
  return { server, network, dbName, make };
}

const put = (readings: Grid): SyncRequest => ({ method: "PUT", url: "/api/v1/projects/p/traverses/t1/readings", body: { readings }, versionField: "version", resourceField: "traverse" });

function renderDraft(queue: SyncQueue, initial: Grid, version: number) {
  const wrapper = ({ children }: { children: ReactNode }) => createElement(OfflineQueueProvider, { queue }, children);
  return renderHook(
    () =>
      useOfflineDraft<Grid, Traverse>({
        key: "traverse:t1",
        initial,
        initialVersion: version,
        toRequest: put,
        fromServer: (t) => t.readings,
      }),
    { wrapper },
  );
}

describe("useOfflineDraft", () => {
  it("applies changes made before the device copy was read, keeps them across a reload, and reports the sync state", async () => {
    const { server, network, make } = await setup({ online: false });
    const q = await make();
    const { result } = renderDraft(q, [[null, null]], 1);
    act(() => result.current.setValue((g) => [[7.7, g[0]![1]!]])); // typed before ready: held, then applied
    await waitFor(() => expect(result.current.ready).toBe(true));
    await waitFor(() => expect(result.current.value).toEqual([[7.7, null]]));
    act(() => result.current.setValue((g) => [[g[0]![0]!, 12.3]]));
    expect(result.current.syncState).toBe("saved-on-device");
    expect(result.current.online).toBe(false);
    expect(result.current.storage).toBe("device");
    await q.idle();
    cleanup();
    q.stop();

    // A reload: a new queue on the same device database, the page's (older) data as initial.
    const again = await make();
    const reloaded = renderDraft(again, [[null, null]], 1);
    await waitFor(() => expect(reloaded.result.current.value).toEqual([[7.7, 12.3]]));
    expect(server.calls).toHaveLength(0);
    act(() => network.set(true));
    await waitFor(() => expect(reloaded.result.current.syncState).toBe("saved"));
    expect(server.readings).toEqual([[7.7, 12.3]]);
    expect(reloaded.result.current.version).toBe(2);
    expect(reloaded.result.current.server).toEqual({ id: "t1", version: 2, readings: [[7.7, 12.3]] });
  });

  it("surfaces both versions on a conflict and takes the server's when asked, sending nothing", async () => {
    const { server, make } = await setup();
    server.readings = [[8.1, 12.9]];
    server.version = 2; // another tablet saved first
    const q = await make();
    const { result } = renderDraft(q, [[null, null]], 1);
    await waitFor(() => expect(result.current.ready).toBe(true));
    act(() => result.current.setValue([[7.7, 12.3]]));
    await waitFor(() => expect(result.current.syncState).toBe("conflict"));
    expect(result.current.conflict).toEqual({ mine: [[7.7, 12.3]], theirs: [[8.1, 12.9]], theirsVersion: 2, message: "Someone else saved this traverse first." });
    expect(result.current.value).toEqual([[7.7, 12.3]]);
    act(() => result.current.resolveConflict("theirs"));
    await waitFor(() => expect(result.current.syncState).toBe("saved"));
    expect(result.current.value).toEqual([[8.1, 12.9]]);
    expect(result.current.version).toBe(2);
    expect(server.calls).toHaveLength(1);
  });

  it("sends mine over the server's version when the technician keeps theirs", async () => {
    const { server, make } = await setup();
    server.readings = [[8.1, 12.9]];
    server.version = 2;
    const q = await make();
    const { result } = renderDraft(q, [[null, null]], 1);
    await waitFor(() => expect(result.current.ready).toBe(true));
    act(() => result.current.setValue([[7.7, 12.3]]));
    await waitFor(() => expect(result.current.syncState).toBe("conflict"));
    act(() => result.current.resolveConflict("mine"));
    await waitFor(() => expect(result.current.syncState).toBe("saved"));
    expect(server.calls.at(-1)!.body).toEqual({ readings: [[7.7, 12.3]], version: 2 });
    expect(server.readings).toEqual([[7.7, 12.3]]);
    expect(result.current.conflict).toBeNull();
  });

  it("resolves a conflict by itself when the server already holds exactly what this device has", async () => {
    const { server, make } = await setup();
    const q = await make();
    const { result } = renderDraft(q, [[null, null]], 1);
    await waitFor(() => expect(result.current.ready).toBe(true));
    // The save reaches the server but its answer is lost; the retry with the old version meets a 409 holding the same readings.
    server.script = ["lose-answer"];
    act(() => result.current.setValue([[5, 6]]));
    await waitFor(() => expect(server.calls).toHaveLength(1));
    act(() => q.retry("traverse:t1"));
    await waitFor(() => expect(result.current.syncState).toBe("saved"));
    expect(result.current.conflict).toBeNull();
    expect(result.current.version).toBe(2);
    expect(server.calls).toHaveLength(2);
  });
});
