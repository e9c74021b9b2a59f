import { closeProcessDatabase } from "@/db/client";

let closing = false;

/** On SIGTERM/SIGINT: close the database (waiting for the query in progress), then exit 143/130. A second signal exits at once. */
export function closeDatabaseOnSignals(): void {
  for (const [signal, code] of [
    ["SIGTERM", 143],
    ["SIGINT", 130],
  ] as const) {
    process.on(signal, () => {
      if (closing) process.exit(code);
      closing = true;
      const timer = setTimeout(() => {
        console.error("[shutdown] the database did not close within 10 s; exiting anyway");
        process.exit(code);
      }, 10_000);
      closeProcessDatabase()
        .then(() => console.log(`[shutdown] ${signal}: database closed`))
        .catch((err) => console.error("[shutdown] closing the database failed", err))
        .finally(() => {
          clearTimeout(timer);
          process.exit(code);
        });
    });
  }
}
