import type { CliIO } from "./io.js";

/**
 * The streams a command sees when its result goes to an `--output` file: standard output stands for
 * that file, no terminal (whatever standard output is), so the default budget, the width and colour
 * are a file's. Otherwise a summary run from a terminal with `-o FILE` took the terminal's height and
 * width, and its colour escapes went into the file.
 */
export function fileOutputIO(io: CliIO): CliIO {
  return { ...io, stdout: { write: (text: string) => io.stdout.write(text), isTTY: false, toFile: true } };
}
