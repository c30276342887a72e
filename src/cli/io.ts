import type { LoadOptions } from "../load/load-options.js";
import type { Tree } from "../model/tree.js";
import type { ReadAgain } from "./file-read-again.js";
import type { MachineLoad } from "./load-threads.js";
import type { ReadBound } from "./read-bounded.js";
import type { OutputFiles } from "./write-output.js";

/** Everything the CLI touches outside itself, passed in so tests drive it directly. */
export interface CliIO {
  /** `toFile`: the result goes to an `--output` file, not to standard output (see file-output-io.ts). */
  stdout: {
    write(text: string): unknown;
    isTTY?: boolean;
    rows?: number;
    columns?: number;
    toFile?: boolean;
  };
  stderr: { write(text: string): unknown; isTTY?: boolean };
  /** Reads standard input whole; with a bound, at most that much (see read-bounded.ts). */
  readStdin(bound?: ReadBound): Promise<Buffer>;
  /** Reads a file whole; with a bound, only a file of that kind and size (see read-bounded.ts). */
  readFile(path: string, bound?: ReadBound): Promise<Buffer>;
  /**
   * Opens a file ("-" for standard input) to be read in chunks, with its size when known. Without it,
   * inputs are read whole with `readFile` / `readStdin` and handed over as one chunk.
   */
  openInput?(name: string): Promise<StreamedInput>;
  /**
   * A named regular file held open to be read again by position (a diff's OLD while its NEW loads
   * against it on one thread: file-read-again.ts); undefined for anything else. Without it, OLD's load
   * keeps the bytes it compares with itself.
   */
  readAgainAt?(name: string): ReadAgain | undefined;
  /**
   * Loads a named file (never "-") on another thread, so a diff's two versions load at once; without
   * it they load here, one after the other.
   */
  loadInWorker?(name: string, options: LoadOptions): Promise<Tree>;
  /**
   * The machine's processors and load when asked, so that a diff uses `loadInWorker` only when a second
   * processor is idle (see load-threads.ts); without it, a diff uses `loadInWorker` whenever it is given.
   */
  machineLoad?(): MachineLoad;
  /** Milliseconds from some fixed point, for progress; without it, no progress is shown. */
  now?(): number;
  env: Record<string, string | undefined>;
  /** File-system calls for --output; Node's own when absent (tests inject faults here). */
  outputFiles?: OutputFiles;
}

/** An input read in chunks. */
export interface StreamedInput {
  /** Size in bytes when known (a regular file), else undefined (a pipe). */
  size: number | undefined;
  chunks: AsyncIterable<Uint8Array>;
}
