import { readFile } from "node:fs/promises";
import { run } from "../../src/cli/main.js";

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs the CLI in-process with captured streams; `stdin` is standard input's content. */
export async function cli(
  args: string[],
  options: { stdin?: string; env?: Record<string, string>; tty?: { rows: number } } = {},
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
    },
    stderr: {
      write: (s: string) => {
        stderr += s;
        return true;
      },
    },
    readStdin: async () => Buffer.from(options.stdin ?? "", "utf8"),
    readFile: (p: string) => readFile(p),
    env: options.env ?? {},
  });
  return { code, stdout, stderr };
}
