import { readFileSync, readlinkSync } from "node:fs";
import { EspalierError } from "../errors.js";
import type { CliIO } from "./io.js";
import { formatError } from "./report-error.js";

/** What the launcher's process offers: its three standard streams and a way to end at once. */
export interface StandardProcess {
  stdout: NodeJS.WriteStream;
  stderr: NodeJS.WriteStream;
  stdin: { isTTY?: boolean };
  exit(code: number): never;
}

/** Said on standard error when the input is "-" and standard input is a terminal. */
export const TERMINAL_INPUT_HINT =
  "espalier: reading the tree from the terminal (standard input is one): type or paste it, then press " +
  "Ctrl-D on a line of its own to end it; or give a file name instead of -\n";

/**
 * Standard output and error as the command line uses them, made to fail loudly: a write that fails
 * (disk full, a device that refuses, a descriptor closed before espalier started) ends espalier with
 * status 2 and one `[IO]` line on standard error, when standard error can still take one; a reader that
 * closes the pipe early (`| head`) ends it quietly with the status the command chose, so `diff
 * --fail-on-change | head` under `set -o pipefail` fails on a change however long the output. Never a
 * stack trace, never status 1 from a failed write (`diff` uses 1 for "the versions differ").
 */
export function standardStreams(proc: StandardProcess): {
  stdout: CliIO["stdout"];
  stderr: CliIO["stderr"];
  /** The exit status to end with, given the one the command chose. */
  finish(code: number): number;
} {
  const outClosed = closedAtStart(1);
  let failed: string | undefined;
  // The reader closed the pipe (EPIPE): the rest of the output has nowhere to go and is dropped, and the
  // command's own status stands (ending at once with 0 hid a `diff --fail-on-change` that found changes).
  let readerGone = false;
  const fail = (reason: string): never => {
    try {
      proc.stderr.write(
        formatError(new EspalierError("IO", `cannot write standard output: ${reason}`, { file: "<stdout>" })),
      );
    } catch {
      // Standard error fails too: the status alone says it.
    }
    return proc.exit(2);
  };
  proc.stdout.on("error", (err: NodeJS.ErrnoException) => {
    if (err.code === "EPIPE") readerGone = true;
    else fail(err.code ?? err.message);
  });
  proc.stderr.on("error", () => proc.exit(2));
  const stdout: CliIO["stdout"] = {
    write(text: string) {
      if (outClosed) {
        failed ??= "it was closed when espalier started (EBADF)";
        return true;
      }
      if (readerGone) return true;
      return proc.stdout.write(text);
    },
    get isTTY() {
      return proc.stdout.isTTY;
    },
    get rows() {
      return proc.stdout.rows;
    },
    get columns() {
      return proc.stdout.columns;
    },
  };
  return {
    stdout,
    stderr: proc.stderr,
    finish(code) {
      if (failed !== undefined) fail(failed);
      return code;
    },
  };
}

/**
 * Whether descriptor `fd` was closed when the process started. Node.js reopens a closed 0, 1 or 2 on
 * /dev/null, read-write, before any script runs; a redirection `> /dev/null` opens it write-only. Read
 * from /proc (Linux); elsewhere false, and a closed descriptor is as `> /dev/null`.
 */
export function closedAtStart(fd: number): boolean {
  try {
    if (readlinkSync(`/proc/self/fd/${fd}`) !== "/dev/null") return false;
    const flags = /^flags:\s*([0-7]+)/m.exec(readFileSync(`/proc/self/fdinfo/${fd}`, "utf8"));
    return flags !== null && (Number.parseInt(flags[1], 8) & 3) === 2;
  } catch {
    return false;
  }
}
