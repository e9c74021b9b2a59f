/**
 * Test helper: takes the data directory lock of argv[2] and prints "held" (or "refused: …"), then
 * keeps it until killed or for at most 20 s. Started as a separate process by tests/db/lock.test.ts.
 */
import { lockDataDir } from "../../db/lock";

try {
  lockDataDir(process.argv[2]!);
  process.stdout.write("held\n");
  setTimeout(() => process.exit(0), 20_000);
} catch (err) {
  process.stdout.write(`refused: ${(err as Error).message}\n`);
  process.exit(3);
}
