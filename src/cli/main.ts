import { EspalierError } from "../errors.js";
import { commands } from "./commands.js";
import { EXIT } from "./exit-codes.js";
import { renderHelp } from "./help.js";
import type { CliIO } from "./io.js";
import { parseCommandLine } from "./parse-command-line.js";
import { formatError } from "./report-error.js";
import { packageVersion } from "./version.js";

/**
 * Runs the CLI on user arguments (without node and script); returns the exit code. Nothing is written
 * to standard output before the whole result exists; an error is one line on standard error.
 */
export async function run(argv: readonly string[], io: CliIO): Promise<number> {
  try {
    const line = parseCommandLine(argv);
    if (line.given.help === true) {
      io.stdout.write(renderHelp(line.command, commands));
      return EXIT.ok;
    }
    if (line.given.version === true) {
      io.stdout.write(`espalier ${packageVersion()}\n`);
      return EXIT.ok;
    }
    const result = await commands[line.command].invoke(line, io);
    if (result.target) {
      // --output's module (and the file-system and crypto modules it needs) loads only for --output.
      const { writeOutput } = await import("./write-output.js");
      await writeOutput(result.target.file, result.text, result.target.inputs, io.outputFiles);
    } else io.stdout.write(result.text);
    return result.exitCode;
  } catch (err) {
    io.stderr.write(formatError(err instanceof RangeError ? outOfRoom(err) : err));
    return EXIT.error;
  }
}

/**
 * The engine's own limits (call stack, longest string, largest array) reached by a huge or deeply nested
 * input or summary: a limit of the input, reported as one, not a crash.
 */
function outOfRoom(err: RangeError): EspalierError {
  return new EspalierError(
    "LIMIT_EXCEEDED",
    `the input or the summary is too large to handle (${err.message}); lower --budget or --max-nodes`,
  );
}
