import { CommanderError } from "commander";
import { EspalierError } from "../errors.js";
import { EXIT } from "./exit-codes.js";
import type { CliIO } from "./io.js";
import { buildProgram } from "./program.js";
import { formatError } from "./report-error.js";

/** Runs the CLI on user arguments (without node and script); returns the exit code. */
export async function run(argv: readonly string[], io: CliIO): Promise<number> {
  let output = "";
  let code: number = EXIT.ok;
  const program = buildProgram(io, (text, exitCode = EXIT.ok) => {
    output = text;
    code = exitCode;
  });
  try {
    await program.parseAsync([...argv], { from: "user" });
  } catch (err) {
    if (err instanceof CommanderError) {
      // Help and version exit 0; commander has already printed its own usage error.
      return err.exitCode === 0 ? EXIT.ok : EXIT.error;
    }
    io.stderr.write(formatError(err));
    return err instanceof EspalierError ? EXIT.error : EXIT.error;
  }
  io.stdout.write(output);
  return code;
}
