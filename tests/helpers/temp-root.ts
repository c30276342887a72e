import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/**
 * Vitest global setup: the run's temporary files (every mkdtemp under tmpdir(), in the test workers and
 * in the command lines they start, which inherit TMPDIR) go into one folder of this run, removed when
 * the run ends. Test runs leave nothing behind in the machine's temporary folder.
 */
export default function setup(): () => void {
  const before = process.env.TMPDIR;
  const root = mkdtempSync(join(tmpdir(), "espalier-test-run-"));
  process.env.TMPDIR = root;
  return () => {
    if (before === undefined) delete process.env.TMPDIR;
    else process.env.TMPDIR = before;
    rmSync(root, { recursive: true, force: true });
  };
}
