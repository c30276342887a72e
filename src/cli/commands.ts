import type { z } from "zod";
import { EspalierError } from "../errors.js";
import { CONFIG_FILES } from "./config.js";
import { effectiveOptions, printConfig } from "./effective-options.js";
import { EXIT } from "./exit-codes.js";
import { printSqlCommand } from "./fact-input.js";
import { hidingInput } from "./hide-input.js";
import { pseudonymKey } from "./input.js";
import type { CliIO } from "./io.js";
import { type CommandName, commandOptions, diffOptionsSchema, summaryOptionsSchema } from "./options.js";
import type { CommandLine } from "./parse-command-line.js";
import { summaryCommand } from "./summary-command.js";
import { checkOutputTarget } from "./write-output.js";

/** What a command hands back: the text for standard output and the exit code. */
export interface CommandOutput {
  text: string;
  exitCode: number;
}

/** A command's result and where it goes: standard output, or the `--output` file. */
export interface Invocation extends CommandOutput {
  target: OutputTarget | undefined;
}

/** An `--output` file and the files the command reads, which it must never overwrite. */
export interface OutputTarget {
  file: string;
  /** Files the command reads ("-" is standard input), the config file included. */
  inputs: string[];
}

/** One command of the command line: its help texts and how it runs. */
export interface CommandSpec {
  /** One sentence on what espalier does, at the top of `--help`. */
  about: string;
  /** `espalier diff [options] <old> <new>`. */
  usage: string;
  /** What the command does, beside its usage line. */
  summary: string;
  /** Names of its arguments, in order; `[new]` is optional (optional ones come last). */
  args: readonly string[];
  /** Worked examples on the demo data, printed by `--help` (a test runs them). */
  examples: string;
  /** What each exit status means. */
  exitStatus: string;
  /** Reads the options (flags over config over defaults), checks the arguments, runs. */
  invoke(line: CommandLine, io: CliIO): Promise<Invocation>;
}

/** Where a command's options came from, beyond their values. */
export interface OptionSources {
  /** The config file read, if any. */
  configFile: string | undefined;
  /** Keys whose value came from the config file. */
  fromConfig: ReadonlySet<string>;
}

interface CommandDef<S extends z.ZodObject> extends Omit<CommandSpec, "invoke"> {
  name: CommandName;
  schema: S;
  /** Work that stops the command before its arguments are checked (e.g. printing a query); else undefined. */
  early?(args: readonly string[], options: z.infer<S>): Promise<CommandOutput | undefined>;
  run(
    args: readonly string[],
    options: z.infer<S>,
    io: CliIO,
    sources: OptionSources,
  ): Promise<CommandOutput>;
}

/** The one path every command takes: options, arguments, the --output check before any work, the run. */
function defineCommand<S extends z.ZodObject>(def: CommandDef<S>): CommandSpec {
  const { name, schema, run, ...texts } = def;
  return {
    ...texts,
    async invoke(line, io) {
      const { options, configFile, fromConfig } = await effectiveOptions(
        line,
        schema,
        commandOptions[name],
        io,
      );
      if (line.given.printConfig === true)
        return { text: await printConfig(options, configFile), exitCode: EXIT.ok, target: undefined };
      const early = await def.early?.(line.args, options);
      if (early) return { ...early, target: undefined };
      checkArguments(def, line.args);
      const target = outputTarget(options as { output?: string; focusFrom?: string }, line);
      if (target) await checkOutputTarget(target.file, target.inputs, io.outputFiles);
      // Under --pseudonymize every error of the work leaves with the input hidden (hide-input.ts).
      const key = pseudonymKey(options as { pseudonymize?: boolean }, io);
      const output = await hidingInput(key, () => run(line.args, options, io, { configFile, fromConfig }));
      return { ...output, target };
    },
  };
}

function checkArguments(def: CommandDef<z.ZodObject>, args: readonly string[]): void {
  const required = def.args.filter((a) => !a.startsWith("["));
  const want = def.args.length;
  if (args.length >= required.length && args.length <= want) return;
  const names = required.map((a) => `<${a}>`).join(" and ");
  if (args.length < required.length) {
    throw new EspalierError(
      "USAGE",
      `missing ${required.length > 1 ? `${names} (got ${args.length})` : names}: a file, or - for standard input`,
      undefined,
      { expected: required.length, got: args.length },
    );
  }
  const extra = args[want];
  const hint = def.name === "summary" ? "; to compare two versions: espalier diff <old> <new>" : "";
  throw new EspalierError(
    "USAGE",
    `unexpected argument ${JSON.stringify(extra)}: ${def.usage} takes at most ${want === 1 ? "one input" : `${want} inputs`}${hint}`,
    undefined,
    { expected: want, got: args.length },
  );
}

/**
 * The --output file with the command's inputs: the arguments, the --focus-from file and the config file
 * it may read (--config FILE, else the default names; a name with no file behind it is skipped later).
 */
function outputTarget(
  options: { output?: string; focusFrom?: string },
  line: CommandLine,
): OutputTarget | undefined {
  if (options.output === undefined) return undefined;
  const { given } = line;
  const configs =
    given.noConfig === true ? [] : typeof given.config === "string" ? [given.config] : CONFIG_FILES;
  const inputs = [...line.args, options.focusFrom, ...configs].filter(
    (name): name is string => typeof name === "string",
  );
  return { file: options.output, inputs };
}

const ABOUT =
  "show the part of a large hierarchy that matters, with enough context, within a line budget. " +
  "Reads nested JSON or YAML, CSV/TSV tables linked by id and parent (or a path column), JSON rows " +
  "and path lists, and scores every node by its degree of interest (Furnas) against the foci.";

/** The commands, by name. */
export const commands: Record<CommandName, CommandSpec> = {
  summary: defineCommand({
    name: "summary",
    schema: summaryOptionsSchema,
    about: ABOUT,
    usage: "espalier [options] <input>",
    summary: "summarise one hierarchy",
    args: ["input"],
    examples: `
Examples
  # The people around one engineer in a 3,000-person org chart, in 30 lines
  espalier fixtures/quillfeather-org.csv --parent-field manager --size-field cost --focus Q2417 --label '{name}, {title}' --budget 30

  # Two teams at once, names replaced by the team and title of each person
  espalier fixtures/quillfeather-org.csv --parent-field manager --label '{title} ({team})' --focus Q2417 --focus Q0627

  # Every test folder of one service, as JSON for a script
  espalier fixtures/tidewater-files.paths --focus 'services/ledger/**/test' --format json

  # Where the bytes are in a listing (find DIR -printf '%s\\t%p\\n' > files.paths)
  find . -printf '%s\\t%p\\n' | espalier - --importance size --budget 25

Paths: names from below the root joined by "/", with "~" written "~0" and "/" written "~1"
(RFC 6901). "*" matches within a name, "**" any number of levels. Every path espalier prints
is accepted back as a focus.`,
    exitStatus: `Exit status: 0 success; 2 usage or input error (one line on standard error, nothing on
standard output).`,
    early: async (args, options) =>
      options.printSql && args.length <= 1
        ? { text: await printSqlCommand(args[0], options), exitCode: EXIT.ok }
        : undefined,
    run: async (args, options, io) => ({
      text: await summaryCommand(args[0], options, io),
      exitCode: EXIT.ok,
    }),
  }),
  diff: defineCommand({
    name: "diff",
    schema: diffOptionsSchema,
    about: ABOUT,
    usage: "espalier diff [options] <old> <new>",
    summary: "show what changed between two versions, within the line budget",
    args: ["old", "new"],
    examples: `
Examples
  # What changed in the dependency tree, in 30 lines
  espalier diff fixtures/tidewater-deps.json fixtures/tidewater-deps.json --budget 30

  # Dependency tree before and after a pull request, failing the CI step when it changed
  espalier diff deps-main.json deps-branch.json --exit-code --budget 40

  # The new version from standard input, as JSON for a script
  generate-deps | espalier diff fixtures/tidewater-deps.json - --format json

Nodes are matched by row id when both versions have ids, otherwise by path; matched by path, a
moved or renamed node shows as one removed and one added.`,
    exitStatus: `Exit status: 0 success (with --exit-code: 0 the versions are the same, 1 they differ); 2 usage
or input error.`,
    // Each command's own code loads when it runs: a start reads only what the run needs.
    run: async (args, options, io) =>
      (await import("./diff-command.js")).diffCommand(args[0], args[1], options, io),
  }),
  explore: defineCommand({
    name: "explore",
    schema: summaryOptionsSchema,
    about: ABOUT,
    usage: "espalier explore [options] <input> [<new>]",
    summary: "look around interactively: the view re-fits the terminal on every key",
    args: ["input", "[new]"],
    examples: `
Examples
  # Look around the org chart; h lists the keys, p quits printing the command line of the view
  espalier explore fixtures/quillfeather-org.csv --parent-field manager --label '{name}, {title}'

  # Explore what changed between two versions (the changes are the foci; n and N step through them)
  espalier explore deps-main.json deps-branch.json

It needs a terminal; --budget, --format and --output belong to printed summaries and are not taken.`,
    exitStatus: `Exit status: 0 left with q or p; 2 usage or input error (nothing drawn); 130 left with Ctrl-C.`,
    run: async (args, options, io, sources) =>
      (await import("./explore-command.js")).exploreCommand(args[0], args[1], options, io, {
        configFile: sources.configFile,
        configSetsImportance: sources.fromConfig.has("importance"),
      }),
  }),
};
