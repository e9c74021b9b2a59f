import { startLocalObjectStore, type LocalObjectStore } from "@/lib/cli/local-object-store";

/** Starts the local S3-compatible store on loopback for one test file and points the app at it. */
export async function useLocalObjectStore(): Promise<LocalObjectStore> {
  const store = await startLocalObjectStore({ dataDir: "memory://" });
  Object.assign(process.env, store.env);
  return store;
}
