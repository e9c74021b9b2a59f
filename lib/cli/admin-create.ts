/**
 * `npm run admin:create`: creates a site administrator, the first account of a production deployment.
 *
 *   npm run admin:create -- --email you@example.org --name "Your Name"
 *
 * Asks for the password twice on the terminal without echoing it; when standard input is not a
 * terminal (scripts), reads the password from its first line. Uses the same database settings as the
 * server (DATABASE_URL, AIRTALLY_DATA_DIR) and refuses while a server holds a PGlite data directory.
 */
import readline from "node:readline";
import { sql } from "drizzle-orm";
import { defaultDataDir, openDatabase } from "@/db/client";
import { auditLog, users } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { newPasswordSchema } from "@/lib/validation/auth";
import "@/lib/validation/zod-browser";
import { z } from "zod";

function argument(name: string): string | undefined {
  const i = process.argv.indexOf(`--${name}`);
  if (i >= 0) return process.argv[i + 1];
  return process.argv.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3);
}

/** Reads one line from a terminal without showing what is typed. */
function askHidden(prompt: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const input = process.stdin;
    process.stdout.write(prompt);
    input.setRawMode(true);
    input.resume();
    input.setEncoding("utf8");
    let value = "";
    const done = (err?: Error) => {
      input.setRawMode(false);
      input.pause();
      input.removeListener("data", onData);
      process.stdout.write("\n");
      if (err) reject(err);
      else resolve(value);
    };
    const onData = (chunk: string) => {
      for (const ch of chunk) {
        if (ch === "\r" || ch === "\n") return done();
        if (ch === "\u0003") return done(new Error("Cancelled."));
        if (ch === "\u007f" || ch === "\b") value = value.slice(0, -1);
        else if (ch >= " ") value += ch;
      }
    };
    input.on("data", onData);
  });
}

async function askLine(prompt: string): Promise<string> {
  const rl = readline.createInterface({ input: process.stdin, output: process.stdout });
  try {
    return await new Promise<string>((resolve) => rl.question(prompt, resolve));
  } finally {
    rl.close();
  }
}

/** The first line of a non-terminal standard input. */
async function readFirstLine(): Promise<string> {
  let data = "";
  for await (const chunk of process.stdin) {
    data += chunk;
    if (data.includes("\n") || data.length > 1000) break;
  }
  return data.split(/\r?\n/)[0] ?? "";
}

async function main() {
  const tty = Boolean(process.stdin.isTTY);
  const email = (argument("email") ?? (tty ? await askLine("E-mail of the site administrator: ") : "")).trim();
  const name = (argument("name") ?? (tty ? await askLine("Their name: ") : "")).trim();
  const emailCheck = z.string().email().max(254).safeParse(email);
  if (!emailCheck.success) throw new Error(email ? `"${email}" is not an e-mail address.` : "Give the e-mail with --email you@example.org.");
  if (!name || name.length > 120) throw new Error("Give a name of 1 to 120 characters with --name \"Your Name\".");

  let password: string;
  if (tty) {
    password = await askHidden("Password (not shown): ");
    const again = await askHidden("Same password again: ");
    if (again !== password) throw new Error("The two passwords differ; nothing was created.");
  } else {
    password = await readFirstLine();
  }
  const checked = newPasswordSchema.safeParse(password);
  if (!checked.success) throw new Error(`Password: ${checked.error.issues[0]!.message} Nothing was created.`);

  const handle = await openDatabase({ url: process.env.DATABASE_URL || undefined, dataDir: defaultDataDir() });
  try {
    const [existing] = await handle.db.select({ id: users.id }).from(users).where(sql`lower(${users.email}) = ${email.toLowerCase()}`);
    if (existing) throw new Error(`An account for ${email} exists already; nothing was changed.`);
    const address = email.toLowerCase();
    const passwordHash = await hashPassword(password);
    await handle.db.transaction(async (tx) => {
      const [created] = await tx.insert(users).values({ email: address, name, passwordHash, isAdmin: true }).returning({ id: users.id });
      // The audit trail says where the first administrator came from (no one was signed in).
      await tx.insert(auditLog).values({ userId: created!.id, actorEmail: address, action: "user.admin_created", entityType: "user", entityId: created!.id, detail: { via: "npm run admin:create" } });
    });
    console.log(`Site administrator ${email} created. Sign in, open a project's Members page, and invite the others.`);
  } finally {
    await handle.close();
  }
}

main().catch((err: Error) => {
  console.error(`admin:create: ${err.message}`);
  process.exit(1);
});
