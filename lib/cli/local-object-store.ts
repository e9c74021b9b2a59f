/**
 * A local S3-compatible store (s3rver) on loopback, for `npm run demo`, development and tests when no
 * object storage is configured. Its files live in the data directory (`<dataDir>/objects`), or in a
 * temporary directory removed on stop when the database is in memory.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import S3rver from "s3rver";

export const LOCAL_BUCKET = "airtally";
// s3rver accepts these fixed credentials; the store only listens on 127.0.0.1.
const LOCAL_KEY = "S3RVER";

export interface LocalObjectStore {
  /** The S3_* variables that point the app at this store. */
  env: { S3_ENDPOINT: string; S3_BUCKET: string; S3_REGION: string; S3_ACCESS_KEY_ID: string; S3_SECRET_ACCESS_KEY: string };
  directory: string;
  stop(): Promise<void>;
}

export async function startLocalObjectStore({ dataDir, port = 0 }: { dataDir: string; port?: number }): Promise<LocalObjectStore> {
  const temporary = dataDir.startsWith("memory://");
  const directory = temporary ? fs.mkdtempSync(path.join(os.tmpdir(), "airtally-objects-")) : path.join(dataDir, "objects");
  fs.mkdirSync(directory, { recursive: true, mode: 0o700 });
  const server = new S3rver({ address: "127.0.0.1", port, directory, silent: true, configureBuckets: [{ name: LOCAL_BUCKET }] });
  const address = await server.run();
  let stopped = false;
  return {
    directory,
    env: {
      S3_ENDPOINT: `http://127.0.0.1:${address.port}`,
      S3_BUCKET: LOCAL_BUCKET,
      S3_REGION: "us-east-1",
      S3_ACCESS_KEY_ID: LOCAL_KEY,
      S3_SECRET_ACCESS_KEY: LOCAL_KEY,
    },
    async stop() {
      if (stopped) return;
      stopped = true;
      await server.close().catch(() => undefined);
      if (temporary) fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}
