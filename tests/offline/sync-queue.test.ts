import "fake-indexeddb/auto";
import fc from "fast-check";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { DEFAULT_BACKOFF, retryDelayMs } from "@/lib/offline/backoff";
import { IdbDraftStore, MemoryDraftStore, openDraftStore } from "@/lib/offline/draft-store";
import { SyncQueue } from "@/lib/offline/sync-queue";
import type { SyncRequest } from "@/lib/offline/types";
import { FakeServer, ManualClock, SwitchableNetwork } from "./support";

type Grid = (number | null)[][];
const KEY = "traverse:t1";
const OWNER = "user-tomasz";
const put = (readings: Grid): SyncRequest => ({ method: "PUT", url: "/api/v1/projects/p/traverses/t1/readings", body: { readings }, versionField: "version", resourceField: "traverse" });

let dbCount = 0;
let clock: ManualClock;
let network: SwitchableNetwork;
let server: FakeServer;
let queues: SyncQueue[];
let dbName: string;

beforeEach(() => {
  clock = new ManualClock();
  network = new SwitchableNetwork(true);
  server = new FakeServer(clock);
  queues = [];
  dbName = `airtally-offline-test-${++dbCount}`;
});
afterEach(() => {
  for (const q of queues) q.stop();
});

async function newQueue(store?: IdbDraftStore | MemoryDraftStore, options: { owner?: string; random?: () => number } = {}) {
  const q = new SyncQueue({
    store: store ?? (await IdbDraftStore.open(dbName)),
    owner: options.owner ?? OWNER,
    fetch: server.fetch,
    network,
    clock,
    random: options.random ?? (() => 0.5), // no jitter: exact delays
    debounceMs: 800,
  });
  queues.push(q);
  await q.start();
  return q;
}

const settle = (q: SyncQueue) => () => q.idle();

describe("the device store", () => {
  it("keeps a typed value across a reload: a new store and queue find it, unsent, in the state it was left", async () => {
    network.set(false);
    const store = await IdbDraftStore.open(dbName);
    const q = await newQueue(store);
    await q.load<Grid>(KEY, { value: [[null, null]], version: 1 });
    await q.edit(KEY, { value: [[7.7, null]], request: put([[7.7, null]]), queue: true });
    await q.edit(KEY, { value: [[7.7, 12.3]], request: put([[7.7, 12.3]]), queue: true });
    await q.idle();
    expect(server.calls).toHaveLength(0);
    q.stop();
    store.close();

    // "Reload": nothing in memory, a fresh connection to the same database.
    const again = await newQueue();
    const record = again.snapshot<Grid>(KEY)!;
    expect(record.value).toEqual([[7.7, 12.3]]);
    expect(record).toMatchObject({ dirty: true, queued: true, state: "saved-on-device", version: 1, revision: 2 });
    expect(again.storage).toBe("device");
    // The server's (older) page data does not replace what was typed.
    const loaded = await again.load<Grid>(KEY, { value: [[null, null]], version: 1 });
    expect(loaded!.value).toEqual([[7.7, 12.3]]);
  });

  it("gives way to a newer server value when nothing local is unsent", async () => {
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[1, 2]], version: 1 });
    await q.edit(KEY, { value: [[1, 3]], request: put([[1, 3]]), queue: true });
    server.version = 1;
    await clock.advance(800, settle(q));
    expect(q.snapshot(KEY)).toMatchObject({ state: "saved", dirty: false, version: 2 });
    const fresh = await newQueue();
    const record = await fresh.load<Grid>(KEY, { value: [[9, 9]], version: 5 });
    expect(record!.value).toEqual([[9, 9]]);
  });

  it("keeps each user's entries apart on a shared tablet", async () => {
    network.set(false);
    const store = await IdbDraftStore.open(dbName);
    const tomasz = await newQueue(store);
    await tomasz.load<Grid>(KEY, { value: [[null]], version: 1 });
    await tomasz.edit(KEY, { value: [[5]], request: put([[5]]), queue: true });
    await tomasz.idle();
    tomasz.stop();
    const other = await newQueue(store, { owner: "user-other" });
    expect(other.pending()).toEqual([]);
    network.set(true);
    await other.idle();
    expect(server.calls).toHaveLength(0);
  });

  it("falls back to memory, and says so, where IndexedDB is missing", async () => {
    const original = globalThis.indexedDB;
    // @ts-expect-error -- simulating a browser without IndexedDB
    delete globalThis.indexedDB;
    try {
      expect((await openDraftStore("nowhere")).kind).toBe("memory");
    } finally {
      globalThis.indexedDB = original;
    }
  });
});

describe("sending", () => {
  it("coalesces typing: many keystrokes within the debounce make one request with the last value", async () => {
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[null, null]], version: 1 });
    for (const v of [1, 1.2, 1.23]) {
      await q.edit(KEY, { value: [[v, null]], request: put([[v, null]]), queue: true });
      await clock.advance(300, settle(q));
    }
    expect(server.calls).toHaveLength(0);
    await clock.advance(800, settle(q));
    expect(server.calls.map((c) => c.body)).toEqual([{ readings: [[1.23, null]], version: 1 }]);
    expect(q.snapshot(KEY)).toMatchObject({ state: "saved", version: 2, dirty: false, server: { version: 2 } });
  });

  it("holds everything while offline and sends it when the network returns", async () => {
    network.set(false);
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[null, null]], version: 1 });
    await q.edit(KEY, { value: [[7.7, 12.3]], request: put([[7.7, 12.3]]), queue: true });
    await clock.advance(10 * 60_000, settle(q));
    expect(server.calls).toHaveLength(0);
    expect(q.snapshot(KEY)!.state).toBe("saved-on-device");

    network.set(true); // the browser's online event
    await q.idle();
    expect(server.calls).toHaveLength(1);
    expect(server.readings).toEqual([[7.7, 12.3]]);
    expect(q.snapshot(KEY)).toMatchObject({ state: "saved", dirty: false, version: 2 });
    expect(q.pending()).toEqual([]);
  });

  it("does not lose a value typed while the previous one was on its way", async () => {
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[null, null]], version: 1 });
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const slow = server.fetch;
    server.fetch = async (url, init) => {
      await gate;
      return slow(url, init);
    };
    await q.edit(KEY, { value: [[1, null]], request: put([[1, null]]), queue: true });
    await clock.advance(800, async () => {});
    expect(q.snapshot(KEY)!.state).toBe("saving");
    await q.edit(KEY, { value: [[1, 2]], request: put([[1, 2]]), queue: true });
    release();
    server.fetch = slow;
    await q.idle();
    await clock.advance(800, settle(q));
    expect(server.calls.map((c) => c.body)).toEqual([
      { readings: [[1, null]], version: 1 },
      { readings: [[1, 2]], version: 2 },
    ]);
    expect(q.snapshot(KEY)).toMatchObject({ state: "saved", version: 3, value: [[1, 2]] });
  });

  it("sends several resources in the order they were changed", async () => {
    network.set(false);
    const q = await newQueue();
    const create = (id: string): SyncRequest => ({ method: "POST", url: "/api/v1/projects/p/systems/s/conditions", body: { id, fanSpeedRpm: 1150 }, resourceField: "conditions" });
    await q.load("conditions:b", { value: {}, version: null });
    await q.load("conditions:a", { value: {}, version: null });
    await q.edit("conditions:b", { value: { n: 1 }, request: create("b"), queue: false });
    clock.t += 1000;
    await q.edit("conditions:a", { value: { n: 2 }, request: create("a"), queue: false });
    void q.sync("conditions:a");
    void q.sync("conditions:b");
    network.set(true);
    await q.idle();
    expect(server.calls.map((c) => c.body.id)).toEqual(["b", "a"]);
  });
});

describe("conflicts", () => {
  it("turns a stale version (409) into a conflict holding both values, sends nothing more, and lets the technician keep theirs", async () => {
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[null, null]], version: 1 });
    // Someone else saved version 2 meanwhile (another tablet).
    server.readings = [[8.1, 12.9]];
    server.version = 2;
    await q.edit(KEY, { value: [[7.7, 12.3]], request: put([[7.7, 12.3]]), queue: true });
    await clock.advance(800, settle(q));

    const record = q.snapshot<Grid, { version: number; readings: Grid }>(KEY)!;
    expect(record.state).toBe("conflict");
    expect(record.value).toEqual([[7.7, 12.3]]); // mine, untouched
    expect(record.conflict).toMatchObject({ server: { version: 2, readings: [[8.1, 12.9]] }, serverVersion: 2, message: "Someone else saved this traverse first." });
    expect(server.readings).toEqual([[8.1, 12.9]]); // theirs, untouched

    // Nothing is retried behind the technician's back, even after a long wait or more typing.
    await q.edit(KEY, { value: [[7.7, 12.4]], request: put([[7.7, 12.4]]), queue: true });
    await clock.advance(30 * 60_000, settle(q));
    expect(server.calls).toHaveLength(1);
    expect(q.snapshot(KEY)!.state).toBe("conflict");

    await q.resolveConflict(KEY, { take: "mine", value: [[7.7, 12.4]], request: put([[7.7, 12.4]]) });
    await q.idle();
    expect(server.calls.at(-1)!.body).toEqual({ readings: [[7.7, 12.4]], version: 2 });
    expect(server.readings).toEqual([[7.7, 12.4]]);
    expect(q.snapshot(KEY)).toMatchObject({ state: "saved", version: 3, conflict: null });
  });

  it("takes the server's version when the technician chooses it, without sending anything", async () => {
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[null, null]], version: 1 });
    server.readings = [[8.1, 12.9]];
    server.version = 2;
    await q.edit(KEY, { value: [[7.7, 12.3]], request: put([[7.7, 12.3]]), queue: true });
    await clock.advance(800, settle(q));
    await q.resolveConflict(KEY, { take: "theirs", value: [[8.1, 12.9]] });
    await clock.advance(60_000, settle(q));
    expect(server.calls).toHaveLength(1);
    expect(q.snapshot(KEY)).toMatchObject({ state: "saved", dirty: false, version: 2, value: [[8.1, 12.9]] });
    // And a reload finds the choice, not the abandoned value.
    const again = await newQueue();
    expect((await again.load<Grid>(KEY))!.value).toEqual([[8.1, 12.9]]);
  });
});

describe("failures and retries", () => {
  it("retries server trouble with a growing wait, capped at one minute, and never gives up", async () => {
    server.script = [503, 503, 503, 503, 503, 503, 503, 503];
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[null]], version: 1 });
    await q.edit(KEY, { value: [[4]], request: put([[4]]), queue: true });
    await clock.advance(800 + 10 * 60_000, settle(q));
    const gaps = server.calls.slice(1).map((c, i) => c.at - server.calls[i]!.at);
    // DEFAULT_BACKOFF: 2 s doubling to a 60 s cap (jitter held at its middle by the test's random).
    expect(gaps.slice(0, 8)).toEqual([2_000, 4_000, 8_000, 16_000, 32_000, 60_000, 60_000, 60_000]);
    expect(server.readings).toEqual([[4]]);
    expect(q.snapshot(KEY)).toMatchObject({ state: "saved", attempts: 0, error: null });
  });

  it("keeps the backoff within its bounds for any attempt and any draw (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 10_000 }), fc.double({ min: 0, max: 0.999999, noNaN: true }), (attempt, r) => {
        const d = retryDelayMs(attempt, DEFAULT_BACKOFF, () => r);
        expect(d).toBeGreaterThanOrEqual(DEFAULT_BACKOFF.baseMs * (1 - DEFAULT_BACKOFF.jitter) - 1);
        expect(d).toBeLessThanOrEqual(DEFAULT_BACKOFF.maxMs);
      }),
    );
    expect(retryDelayMs(1, DEFAULT_BACKOFF, () => 0)).toBe(1_600);
    expect(retryDelayMs(1_000_000, DEFAULT_BACKOFF, () => 0.999)).toBe(60_000);
  });

  it("pauses everything after a send finds no network, instead of trying every record at once", async () => {
    server.script = ["offline"];
    const q = await newQueue();
    for (const k of ["traverse:a", "traverse:b", "traverse:c"]) {
      await q.load<Grid>(k, { value: [[null]], version: 1 });
      await q.edit(k, { value: [[1]], request: { ...put([[1]]), url: `/api/${k}` }, queue: true });
    }
    await clock.advance(800, settle(q));
    expect(server.calls).toHaveLength(1);
    expect(q.snapshot("traverse:a")).toMatchObject({ state: "saved-on-device", attempts: 1, error: { status: 0, message: "No connection to the server." } });
  });

  it("keeps a refused value (400) on the device with the server's field errors, and sends it again once changed", async () => {
    server.script = [400];
    const q = await newQueue();
    await q.load<Grid>(KEY, { value: [[null]], version: 1 });
    await q.edit(KEY, { value: [[-9999]], request: put([[-9999]]), queue: true });
    await clock.advance(800 + 10 * 60_000, settle(q));
    expect(server.calls).toHaveLength(1);
    expect(q.snapshot(KEY)).toMatchObject({ state: "error", dirty: true, value: [[-9999]], error: { status: 400, fields: { "readings.0.1": "must be a number" } } });
    await q.edit(KEY, { value: [[9]], request: put([[9]]), queue: true });
    await clock.advance(800, settle(q));
    expect(server.readings).toEqual([[9]]);
  });

  it("tries again after a reload what was refused because the user had been signed out", async () => {
    server.script = [401];
    const store = await IdbDraftStore.open(dbName);
    const q = await newQueue(store);
    await q.load<Grid>(KEY, { value: [[null]], version: 1 });
    await q.edit(KEY, { value: [[3]], request: put([[3]]), queue: true });
    await clock.advance(800, settle(q));
    expect(q.snapshot(KEY)).toMatchObject({ state: "error", error: { status: 401 } });
    expect(q.snapshot(KEY)!.error!.message).toContain("stays on this device");
    q.stop();
    const again = await newQueue();
    await again.idle();
    expect(server.readings).toEqual([[3]]);
    expect(again.snapshot(KEY)!.state).toBe("saved");
  });

  it("stores a create once when its answer was lost: the retry with the same client id finds it", async () => {
    server.script = ["lose-answer"];
    const q = await newQueue(new MemoryDraftStore());
    const request: SyncRequest = { method: "POST", url: "/api/v1/projects/p/systems/s/conditions", body: { id: "c-1", fanSpeedRpm: 1150 }, resourceField: "conditions" };
    await q.load("conditions:c-1", { value: {}, version: null });
    await q.edit("conditions:c-1", { value: { fanSpeedRpm: 1150 }, request, queue: false });
    await q.sync("conditions:c-1");
    await q.idle();
    expect(q.snapshot("conditions:c-1")!.state).toBe("saved-on-device");
    await clock.advance(2_000, settle(q));
    expect(server.calls).toHaveLength(2);
    expect(server.created.size).toBe(1);
    expect(q.snapshot("conditions:c-1")).toMatchObject({ state: "saved", server: { id: "c-1" } });
  });

  it("keeps a form on the device until it is sent, and forgets it when discarded", async () => {
    const store = await IdbDraftStore.open(dbName);
    const q = await newQueue(store);
    await q.load("conditions-form:s", { value: { fanSpeedRpm: "" }, version: null });
    await q.edit("conditions-form:s", { value: { fanSpeedRpm: "11" }, request: null, queue: false });
    await clock.advance(60_000, settle(q));
    expect(server.calls).toHaveLength(0);
    expect(q.snapshot("conditions-form:s")).toMatchObject({ state: "saved-on-device", dirty: true });
    await q.discard("conditions-form:s");
    expect(await store.get(OWNER, "conditions-form:s")).toBeUndefined();
  });
});

describe("reading offline", () => {
  it("returns the last answer kept on the device when the network fails, and refusals as they are", async () => {
    const { withDeviceCopy } = await import("@/lib/offline/read-cache");
    const q = await newQueue();
    const fresh = await withDeviceCopy(q, "instruments", async () => ["MM-30418"]);
    expect(fresh).toMatchObject({ data: ["MM-30418"], fromDevice: false });
    const offline = await withDeviceCopy(q, "instruments", async () => {
      throw new TypeError("Failed to fetch");
    });
    expect(offline).toMatchObject({ data: ["MM-30418"], fromDevice: true });
    await expect(withDeviceCopy(q, "instruments", async () => Promise.reject(Object.assign(new Error("Forbidden"), { status: 403 })))).rejects.toThrow("Forbidden");
    await expect(withDeviceCopy(q, "never-fetched", async () => Promise.reject(new TypeError("Failed to fetch")))).rejects.toThrow(TypeError);
  });
});

describe("device ids", () => {
  it("makes RFC 9562 version-4 UUIDs even without crypto.randomUUID", async () => {
    const { newId } = await import("@/lib/offline/ids");
    const original = crypto.randomUUID;
    // @ts-expect-error -- an insecure context has no randomUUID
    crypto.randomUUID = undefined;
    try {
      const ids = new Set(Array.from({ length: 200 }, () => newId()));
      expect(ids.size).toBe(200);
      for (const id of ids) expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    } finally {
      crypto.randomUUID = original;
    }
  });
});
