import { type Command, CommanderError } from "commander";
import { EspalierError } from "../errors.js";
import { safeText } from "../render/safe-text.js";
import { CONFIG_FILES } from "./config.js";
import { EXIT } from "./exit-codes.js";
import type { CliIO } from "./io.js";
import { buildProgram } from "./program.js";
import { formatError } from "./report-error.js";
import { checkOutputTarget, writeOutput } from "./write-output.js";

/** Runs the CLI on user arguments (without node and script); returns the exit code. */
export async function run(argv: readonly string[], io: CliIO): Promise<number> {
  let output = "";
  let code: number = EXIT.ok;
  let target: OutputTarget | undefined;
  const program = buildProgram(io, (text, exitCode = EXIT.ok) => {
    output = text;
    code = exitCode;
  });
  // --output belongs to every command; a target that is one of the inputs is refused before any work.
  program.hook("preAction", async (_program, action) => {
    target = outputTarget(program, action);
    if (target) await checkOutputTarget(target.file, target.inputs, io.outputFiles);
  });
  for (const command of [program, ...program.commands]) {
    command.configureOutput({ outputError: (text, write) => write(oneSafeLine(text)) });
  }
  try {
    await program.parseAsync([...argv], { from: "user" });
    if (target) await writeOutput(target.file, output, target.inputs, io.outputFiles);
  } catch (err) {
    if (err instanceof CommanderError) {
      // Help and version exit 0; commander has already printed its own usage error.
      return err.exitCode === 0 ? EXIT.ok : EXIT.error;
    }
    io.stderr.write(formatError(err instanceof RangeError ? outOfRoom(err) : err));
    return EXIT.error;
  }
  if (!target) io.stdout.write(output);
  return code;
}

interface OutputTarget {
  file: string;
  /** Files the command reads ("-" is standard input), the config file included. */
  inputs: string[];
}

/**
 * The --output file of the command about to run (given before or after a subcommand), with its inputs:
 * the arguments, the --focus-from file and the config file it may read: --config FILE, else the
 * default names (a name with no file behind it is skipped; when both exist, both are kept safe).
 */
function outputTarget(program: Command, action: Command): OutputTarget | undefined {
  const opts = action.opts();
  const file: unknown = opts.output ?? program.opts().output;
  if (typeof file !== "string" || file === "") return undefined;
  const configs = opts.config === false ? [] : typeof opts.config === "string" ? [opts.config] : CONFIG_FILES;
  const inputs = [...action.processedArgs, opts.focusFrom, ...configs].filter(
    (name): name is string => typeof name === "string",
  );
  return { file, inputs };
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

/**
 * Commander's usage errors quote argv as typed, and a value may hold a line break or a control
 * sequence: its message becomes one line (breaks as spaces), made safe to print (see safeText).
 */
function oneSafeLine(text: string): string {
  return `${safeText(text.trimEnd().replace(/\r?\n/g, " "), 2000)}\n`;
}
