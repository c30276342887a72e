import { readFile } from "node:fs/promises";
import { CONFIG_FILES } from "../../src/cli/config.js";
import { run } from "../../src/cli/main.js";
import { type ReadBound, readBounded, readStreamBounded } from "../../src/cli/read-bounded.js";
import type { OutputFiles } from "../../src/cli/write-output.js";

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/**
 * Runs the CLI in-process with captured streams; `stdin` is standard input's content (text is UTF-8);
 * `outputFiles` replaces the file-system calls of --output.
 */
export async function cli(
  args: string[],
  options: {
    stdin?: string | Uint8Array;
    env?: Record<string, string>;
    tty?: { rows: number; columns?: number };
    outputFiles?: OutputFiles;
    /**
     * Files served before the real file system (e.g. a config file in the current directory). The
     * default config names (.espalier.yaml, .espalier.yml) come only from here, never from the working
     * directory, so a config file left there cannot change a test's result.
     */
    files?: Record<string, string>;
  } = {},
): Promise<CliResult> {
  let stdout = "";
  let stderr = "";
  const code = await run(args, {
    stdout: {
      write: (s: string) => {
        stdout += s;
        return true;
      },
      isTTY: options.tty !== undefined,
      rows: options.tty?.rows,
      columns: options.tty?.columns,
    },
    stderr: {
      write: (s: string) => {
        stderr += s;
        return true;
      },
    },
    readStdin: async (bound?: ReadBound) => {
      const bytes =
        typeof options.stdin === "string" || options.stdin === undefined
          ? Buffer.from(options.stdin ?? "", "utf8")
          : Buffer.from(options.stdin);
      return bound ? readStreamBounded([bytes], "-", bound) : bytes;
    },
    readFile: (p: string, bound?: ReadBound) => {
      if (options.files && p in options.files) return Promise.resolve(Buffer.from(options.files[p], "utf8"));
      if ((CONFIG_FILES as readonly string[]).includes(p)) return Promise.reject(notFound(p));
      return bound ? readBounded(p, bound) : readFile(p);
    },
    env: options.env ?? {},
    outputFiles: options.outputFiles,
  });
  return { code, stdout, stderr };
}

function notFound(path: string): NodeJS.ErrnoException {
  return Object.assign(new Error(`ENOENT: no such file, open '${path}'`), { code: "ENOENT" });
}
