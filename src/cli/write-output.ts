import { randomBytes } from "node:crypto";
import { rmSync } from "node:fs";
import { chmod, lstat, open, readlink, realpath, rename, rm, stat } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { EspalierError } from "../errors.js";

/** What a file is, as far as telling two names of one file apart goes. */
export interface FileIdentity {
  dev: number;
  ino: number;
  mode: number;
  isFile(): boolean;
}

/** The file-system calls `--output` makes: Node's by default; tests replace some to inject faults. */
export interface OutputFiles {
  realpath(path: string): Promise<string>;
  stat(path: string): Promise<FileIdentity>;
  /** Creates `path`, failing if anything exists there (a link included), writes `text`, flushes it to disk. */
  writeNew(path: string, text: string): Promise<void>;
  chmod(path: string, mode: number): Promise<void>;
  rename(from: string, to: string): Promise<void>;
  /** Removes `path`; no error when it is already gone. */
  remove(path: string): Promise<void>;
  /** The target of a symbolic link at `path`, or undefined when `path` is not one (or is missing). */
  linkTarget?(path: string): Promise<string | undefined>;
}

export const nodeOutputFiles: OutputFiles = {
  realpath: (path) => realpath(path),
  stat: (path) => stat(path),
  async writeNew(path, text) {
    const handle = await open(path, "wx", 0o666);
    try {
      await handle.writeFile(text, "utf8");
      await handle.sync();
    } finally {
      await handle.close();
    }
  },
  chmod: (path, mode) => chmod(path, mode),
  rename: (from, to) => rename(from, to),
  remove: (path) => rm(path, { force: true }),
  async linkTarget(path) {
    try {
      return (await lstat(path)).isSymbolicLink() ? await readlink(path) : undefined;
    } catch {
      return undefined;
    }
  },
};

/** Signals that end espalier while it writes: the temporary file is removed first (Ctrl-C, kill, hang-up). */
const ENDING_SIGNALS = ["SIGINT", "SIGTERM", "SIGHUP"] as const;

/**
 * The temporary file for `final`: hidden, in the same folder, named for espalier, the process and the
 * file it will become (`.FILE.espalier-PID-RANDOM.tmp`), so one left behind by SIGKILL or a power cut
 * is recognisable and never read as the output itself.
 */
export function temporaryName(final: string, pid = process.pid): string {
  return join(dirname(final), `.${basename(final)}.espalier-${pid}-${randomBytes(4).toString("hex")}.tmp`);
}

/** Standard input's name in the file system, to tell whether it was redirected from the output file. */
const STDIN = "/dev/stdin";

/**
 * Writes `text` to the file `target` whole or not at all: into a new temporary file in the same folder
 * (so the rename cannot cross file systems), flushed, then renamed over `target` (POSIX rename(2)
 * replaces it atomically). On any failure the temporary file is removed and `target` is as before.
 * A link at `target` is followed: the file it names is replaced, with its permissions kept.
 * Refuses, before writing anything, when `target` is one of `inputs` ("-" is standard input), compared
 * by resolved real path and by device and inode, so another name or a hard link of an input is caught.
 */
export async function writeOutput(
  target: string,
  text: string,
  inputs: readonly string[],
  files: OutputFiles = nodeOutputFiles,
): Promise<void> {
  const existing = await identify(files, target);
  if (!existing) await refuseDanglingLink(files, target);
  const final = existing ? existing.path : resolve(target);
  if (existing) {
    if (!existing.id.isFile()) fail(target, "it exists and is not a regular file");
    await refuseInputs(files, target, existing, inputs);
  }
  const temp = temporaryName(final);
  // A signal during the write removes the temporary file, then ends espalier as the signal would have.
  const onSignal = (signal: NodeJS.Signals) => {
    stopListening();
    try {
      rmSync(temp, { force: true });
    } catch {
      // Gone already, or not ours to remove: the signal still ends the process.
    }
    process.kill(process.pid, signal);
  };
  const stopListening = () => {
    for (const signal of ENDING_SIGNALS) process.off(signal, onSignal);
  };
  for (const signal of ENDING_SIGNALS) process.on(signal, onSignal);
  try {
    await files.writeNew(temp, text);
    if (existing) await files.chmod(temp, existing.id.mode & 0o7777);
    await files.rename(temp, final);
  } catch (error) {
    await files.remove(temp).catch(() => undefined);
    fail(target, reason(error));
  } finally {
    stopListening();
  }
}

/**
 * USAGE when `target` names one of `inputs`, which `--output` would destroy. Inputs that cannot be
 * looked up (missing, or "-" from a pipe) cannot be the target file.
 */
export async function checkOutputTarget(
  target: string,
  inputs: readonly string[],
  files: OutputFiles = nodeOutputFiles,
): Promise<void> {
  const existing = await identify(files, target);
  if (existing) await refuseInputs(files, target, existing, inputs);
  else await refuseDanglingLink(files, target);
}

interface Existing {
  path: string;
  id: FileIdentity;
}

/** The real path and identity of `path`, or undefined when nothing is there. */
async function identify(files: OutputFiles, path: string): Promise<Existing | undefined> {
  let real: string;
  try {
    real = await files.realpath(path);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return undefined;
    fail(path, reason(error));
  }
  try {
    return { path: real, id: await files.stat(real) };
  } catch (error) {
    fail(path, reason(error));
  }
}

async function refuseInputs(
  files: OutputFiles,
  target: string,
  existing: Existing,
  inputs: readonly string[],
): Promise<void> {
  for (const input of inputs) {
    const other = await identify(files, input === "-" ? STDIN : input).catch(() => undefined);
    if (!other) continue;
    const same =
      other.path === existing.path ||
      (other.id.ino !== 0 && other.id.ino === existing.id.ino && other.id.dev === existing.id.dev);
    if (same) {
      const named = input === "-" ? "standard input" : `the input ${input}`;
      throw new EspalierError(
        "USAGE",
        `--output ${target} is ${named}; writing there would destroy it, so choose another file`,
        { file: target },
      );
    }
  }
}

/**
 * IO when `target` is a symbolic link whose file does not exist: writing would either create a file
 * wherever the link points (a link committed to a repository can point anywhere) or replace the link.
 * espalier does neither; the user removes the link or names the file.
 */
async function refuseDanglingLink(files: OutputFiles, target: string): Promise<void> {
  const to = await files.linkTarget?.(target);
  if (to !== undefined)
    fail(
      target,
      `it is a symbolic link to ${to}, which does not exist; remove the link or write to the file itself`,
    );
}

function fail(target: string, why: string): never {
  throw new EspalierError("IO", `cannot write ${target}: ${why}`, { file: target });
}

function reason(error: unknown): string {
  return (error as NodeJS.ErrnoException).code ?? (error as Error).message ?? String(error);
}
