/**
 * The environment the launcher gives the server. Demo mode is decided by the command (`npm run demo`),
 * never inherited: a stray AIRTALLY_DEMO=1 in a production shell must not create the demo accounts.
 */
export function launcherEnv({ demo, port, env }: { demo: boolean; port: number; env: Record<string, string | undefined> }): NodeJS.ProcessEnv {
  // Sites often have no internet: do not let the framework try to send usage telemetry.
  const out: NodeJS.ProcessEnv = { NEXT_TELEMETRY_DISABLED: "1", ...env, NODE_ENV: "production", PORT: String(port) } as NodeJS.ProcessEnv;
  if (demo) out.AIRTALLY_DEMO = "1";
  else delete out.AIRTALLY_DEMO;
  // Links in e-mails and on reports; set AIRTALLY_PUBLIC_URL to the address people use.
  out.AIRTALLY_PUBLIC_URL ||= `http://localhost:${port}`;
  return out;
}
