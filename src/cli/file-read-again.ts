import { closeSync, fstatSync, openSync, readSync, statSync } from "node:fs";
import type { BytesAt } from "../load/load-options.js";

/**
 * A named input's bytes read again by position while a later version loads against it (a diff's OLD
 * for its NEW on one thread: LoadOptions.inputReadAgain, earlierInput), with the means to tell that
 * they are still the bytes its load read.
 */
export interface ReadAgain extends BytesAt {
  /**
   * Whether the file is the one opened and as it was then: the same file at its name (device and
   * inode), of the same size and times of change (ctime moves on every write, and no call sets it
   * back). A file written to between the two loads, or replaced, is read again in full instead.
   */
  unchanged(): boolean;
  /** Whether a load read the file again (`read` was called): only then does a change matter. */
  readFrom(): boolean;
  close(): void;
}

/**
 * A regular file opened to be read again (the descriptor held, so the same file is read whatever
 * happens to its name), its state taken now, before its load reads it; undefined for anything else
 * (standard input, a pipe or a named pipe, a file that cannot be opened: its load says why).
 */
export function fileReadAgain(name: string): ReadAgain | undefined {
  if (name === "-") return undefined;
  let fd: number;
  try {
    // Only a regular file is opened: opening a named pipe would wait for its writer, here, before
    // the load that reads it has begun.
    if (!statSync(name).isFile()) return undefined;
    fd = openSync(name, "r");
  } catch {
    return undefined;
  }
  const first = fstatSync(fd, { bigint: true });
  if (!first.isFile()) {
    closeSync(fd);
    return undefined;
  }
  const same = (s: { dev: bigint; ino: bigint; size: bigint; mtimeNs: bigint; ctimeNs: bigint }) =>
    s.dev === first.dev &&
    s.ino === first.ino &&
    s.size === first.size &&
    s.mtimeNs === first.mtimeNs &&
    s.ctimeNs === first.ctimeNs;
  let open = true;
  let read = false;
  return {
    read: (into, offset, length, position) => {
      read = true;
      return readSync(fd, into, offset, length, position);
    },
    readFrom: () => read,
    unchanged: () => {
      if (!open) return false;
      try {
        return same(fstatSync(fd, { bigint: true })) && same(statSync(name, { bigint: true }));
      } catch {
        return false;
      }
    },
    close: () => {
      if (open) closeSync(fd);
      open = false;
    },
  };
}
