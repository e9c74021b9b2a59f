/**
 * Runs once when the server starts. On the Node.js runtime it closes the database cleanly on
 * SIGTERM and SIGINT (PGlite flushes and releases the data directory lock) before the process
 * exits. The launcher (lib/cli/serve.ts) sets NEXT_MANUAL_SIG_HANDLE so that the framework leaves
 * these signals to us; without it (next dev) the framework's own handling stands.
 */
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs" || !process.env.NEXT_MANUAL_SIG_HANDLE) return;
  const { closeDatabaseOnSignals } = await import("./lib/server/shutdown");
  closeDatabaseOnSignals();
}
