/**
 * `npm run -s calc -- <layout|traverse|network>`: one JSON document on stdin, one on stdout, exit 0.
 * Bad input (unparsable JSON, unknown command, invalid fields): exit 2, nothing on stdout, and
 * `{"error":{"message","fields"}}` on stderr.
 */
import { runCalcCommand } from "@/lib/airflow/commands";
import type { ErrorBody } from "@/lib/validation/result";

const EXIT_BAD_INPUT = 2;

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(typeof chunk === "string" ? Buffer.from(chunk) : chunk);
  return Buffer.concat(chunks).toString("utf8");
}

function badInput(error: ErrorBody["error"]): void {
  process.stderr.write(JSON.stringify({ error }) + "\n");
  process.exitCode = EXIT_BAD_INPUT;
}

async function main(): Promise<void> {
  const command = process.argv[2] ?? "";
  const text = await readStdin();
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (error) {
    const detail = error instanceof Error ? error.message : String(error);
    const message = text.trim() === "" ? "No input: send one JSON document on stdin." : `The input is not valid JSON: ${detail}`;
    badInput({ message, fields: { "(input)": message } });
    return;
  }
  const result = runCalcCommand(command, input);
  if (!result.ok) {
    badInput(result.error);
    return;
  }
  process.stdout.write(JSON.stringify(result.value, null, 2) + "\n");
}

void main();
