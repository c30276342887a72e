import { EspalierError } from "../errors.js";
import type { CommandOutput } from "./command-output.js";
import { commentSizeNote } from "./comment-size.js";
import { CONFIG_FILES } from "./config.js";
import { effectiveOptions, optionsInEffectYaml } from "./effective-options.js";
import { EXIT } from "./exit-codes.js";
import { checkFactOptionsRead, printSqlCommand } from "./fact-input.js";
import { fileOutputIO } from "./file-output-io.js";
import { hidingInput } from "./hide-input.js";
import { pseudonymKey } from "./input.js";
import type { CliIO } from "./io.js";
import { optionFlags } from "./option-flags.js";
import {
  type CommandName,
  commandOptions,
  diffOptionsSchema,
  type OptionSpec,
  type OptionsOf,
  type OptionsSchema,
  printedOnly,
  type SharedCliOptions,
  sharedOptions,
  summaryOptionsSchema,
} from "./options.js";
import type { CommandLine } from "./parse-command-line.js";
import { summaryCommand } from "./summary-command.js";

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

/** A worked example of `--help`: what it shows, and the shell line that shows it. */
export interface Example {
  what: string;
  /** One line for a POSIX shell, run from the project's folder (the demo data is in fixtures/). */
  line: string;
}

/** One command of the command line: its help texts and how it runs. */
export interface CommandSpec {
  /** `espalier diff OLD NEW`: how it is called, its arguments in capitals. */
  usage: string;
  /** What the command does, beside its usage line. */
  summary: string;
  /** Names of its arguments, in order; `[new]` is optional (optional ones come last). */
  args: readonly string[];
  /** Worked examples on the demo data, printed by `--help` (tests/cli/help-examples.test.ts runs each). */
  examples: readonly Example[];
  /** What else a reader of the help needs: paths, matching, the terminal. */
  notes: string;
  /** What each exit status means, by status. */
  exitStatus: readonly (readonly [number, string])[];
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

interface CommandDef<T extends Record<string, OptionSpec>> extends Omit<CommandSpec, "invoke"> {
  name: CommandName;
  schema: OptionsSchema<T>;
  /** Work that stops the command before its arguments are checked (e.g. printing a query); else undefined. */
  early?(args: readonly string[], options: OptionsOf<T>): Promise<CommandOutput | undefined>;
  run(
    args: readonly string[],
    options: OptionsOf<T>,
    io: CliIO,
    sources: OptionSources,
  ): Promise<CommandOutput>;
}

/** The one path every command takes: options, arguments, the --output check before any work, the run. */
function defineCommand<T extends Record<string, OptionSpec>>(def: CommandDef<T>): CommandSpec {
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
      if (line.given.optionsInEffect === true)
        return { text: await optionsInEffectYaml(options, configFile), exitCode: EXIT.ok, target: undefined };
      const early = await def.early?.(line.args, options);
      if (early) return { ...early, target: undefined };
      checkArguments(def, line.args);
      checkFactOptionsRead(options as SharedCliOptions & { printSql?: boolean }, fromConfig, name);
      const shareNote = checkShareFormat(
        options as { share?: string; format?: string },
        fromConfig,
        configFile,
      );
      if (shareNote) io.stderr.write(shareNote);
      const target = outputTarget(options as { output?: string; focusFrom?: string; nodes?: string[] }, line);
      if (target) {
        const { checkOutputTarget } = await import("./write-output.js");
        await checkOutputTarget(target.file, target.inputs, io.outputFiles);
      }
      // Under --pseudonymize every error of the work leaves with the input hidden (hide-input.ts).
      const key = pseudonymKey(options as { pseudonymize?: boolean }, io);
      // A result bound for an --output file is laid out and coloured for a file, not for the terminal.
      const runIO = target ? fileOutputIO(io) : io;
      const output = await hidingInput(key, () => run(line.args, options, runIO, { configFile, fromConfig }));
      const long = commentSizeNote((options as { format?: string }).format, output.text);
      if (long) io.stderr.write(long);
      return { ...output, target };
    },
  };
}

/**
 * `--share` adds percentages to the text and Markdown lines; JSON and SVG have no place for them, so
 * given on the command line with `--format json` or `svg` it would be dropped with exit 0: USAGE. From
 * the config file (a project's preference for its printed summaries) it does not stop a JSON run, but
 * is not dropped unsaid either: the note returned (for standard error) says it is left out and where
 * the numbers are; undefined when there is nothing to say.
 */
function checkShareFormat(
  options: { share?: string; format?: string },
  fromConfig: ReadonlySet<string>,
  configFile: string | undefined,
): string | undefined {
  if (options.share === undefined || options.share === "none") return undefined;
  if (options.format !== "json" && options.format !== "svg") return undefined;
  const instead =
    options.format === "json"
      ? "each node's size is in the JSON, as are its parent's and the root's (a share is their ratio)"
      : "block widths follow size, and each block's tooltip gives its size";
  if (fromConfig.has("share"))
    return `espalier: note: share: ${options.share} from ${configFile ?? "the config file"} is left out: --format ${options.format} has no place for percentages (${instead}); --share none leaves this note out\n`;
  throw new EspalierError(
    "USAGE",
    `--share adds percentages to text and Markdown lines only; --format ${options.format} has none: ${instead}`,
    undefined,
    { option: "--share" },
  );
}

function checkArguments(def: CommandDef<Record<string, OptionSpec>>, args: readonly string[]): void {
  const required = def.args.filter((a) => !a.startsWith("["));
  const want = def.args.length;
  if (args.length >= required.length && args.length <= want) return;
  if (args.length < required.length) {
    // Name only what is missing, and what each given argument is read as.
    const missing = required
      .slice(args.length)
      .map((a) => a.toUpperCase())
      .join(" and ");
    const given = args
      .map((a, k) => `${JSON.stringify(a)} is read as ${required[k].toUpperCase()}; `)
      .join("");
    const each = required.length > 1 ? `${def.usage} reads ${required.length} inputs, each` : "";
    throw new EspalierError(
      "USAGE",
      `missing ${missing}: ${given}${each === "" ? "a file" : `${each} a file`}, or - for standard input`,
      undefined,
      { expected: required.length, got: args.length },
    );
  }
  const extra = args[want];
  const hint = def.name === "summary" ? "; to compare two versions: espalier diff OLD NEW" : "";
  throw new EspalierError(
    "USAGE",
    `unexpected argument ${JSON.stringify(extra)}: ${def.usage} takes at most ${want === 1 ? "one input" : `${want} inputs`}${hint}`,
    undefined,
    { expected: want, got: args.length },
  );
}

/**
 * The --output file with the command's inputs: the arguments, the --focus-from and --nodes files and the
 * config file it may read (--config FILE, else the default names; a name with no file behind it is
 * skipped later).
 */
function outputTarget(
  options: { output?: string; focusFrom?: string; nodes?: string[] },
  line: CommandLine,
): OutputTarget | undefined {
  if (options.output === undefined) return undefined;
  const { given } = line;
  const configs =
    given.withoutConfig === true ? [] : typeof given.config === "string" ? [given.config] : CONFIG_FILES;
  const inputs = [...line.args, options.focusFrom, ...(options.nodes ?? []), ...configs].filter(
    (name): name is string => typeof name === "string",
  );
  return { file: options.output, inputs };
}

/** The commands, by name. */
export const commands: Record<CommandName, CommandSpec> = {
  summary: defineCommand({
    name: "summary",
    schema: summaryOptionsSchema,
    usage: "espalier INPUT",
    summary: "summarise one hierarchy",
    args: ["input"],
    examples: [
      {
        what: "The people around one engineer of a 2,900-person org chart, in 30 lines",
        line: "espalier fixtures/quillfeather-org.csv --parent-field manager --size-field cost --focus Q2417 --label '{name}, {title}' --budget 30",
      },
      {
        what: "Two people at once, each shown by title and team",
        line: "espalier fixtures/quillfeather-org.csv --parent-field manager --label '{title} ({team})' --focus Q2417 --focus Q0627",
      },
      {
        what: "Every test folder of one service, as JSON for a script",
        line: "espalier fixtures/tidewater-files.paths --focus 'services/ledger/**/test' --format json",
      },
      {
        what: "Where the bytes are in a listing; a focus may be written as find writes its paths",
        line: "find fixtures -printf '%s\\t%p\\n' | espalier - --importance size --focus fixtures/external --budget 15",
      },
    ],
    notes:
      'Paths are the names below the root joined by "/", with "~" written "~0" and "/" written "~1" ' +
      '(RFC 6901). "*" matches within a name, "**" any number of levels. Every path espalier prints is ' +
      "accepted back as a focus, and so is a path as a listing prints it (./a/b, or the listed folder's " +
      "name in front).",
    exitStatus: [
      [0, "the summary is printed"],
      [2, "a usage or input error: one line on standard error, nothing on standard output"],
    ],
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
    usage: "espalier diff OLD NEW",
    summary: "what changed between two versions, within the line budget",
    args: ["old", "new"],
    examples: [
      {
        what: "What a clean-up of one service's tests would take away (the new version on standard input)",
        line: "grep -v 'services/ledger/test' fixtures/tidewater-files.paths | espalier diff fixtures/tidewater-files.paths - --budget 20",
      },
      {
        what: "The same as JSON, failing a CI step (status 1) because something changed",
        line: "grep -v 'services/ledger/test' fixtures/tidewater-files.paths | espalier diff fixtures/tidewater-files.paths - --format json --fail-on-change",
      },
      {
        what: "Two equal versions: nothing changed, so status 0 even with --fail-on-change",
        line: "espalier diff fixtures/tidewater-deps.json fixtures/tidewater-deps.json --fail-on-change --budget 10",
      },
    ],
    notes:
      "Nodes are matched by row id when both versions have ids, otherwise by path; matched by path, a " +
      "moved or renamed node shows as one removed and one added. The changes are the foci.",
    exitStatus: [
      [0, "the diff is printed (with --fail-on-change: and the versions are the same)"],
      [1, "with --fail-on-change only: the versions differ"],
      [2, "a usage or input error: one line on standard error, nothing on standard output"],
    ],
    // Each command's own code loads when it runs: a start reads only what the run needs.
    run: async (args, options, io) =>
      (await import("./diff-command.js")).diffCommand(args[0], args[1], options, io),
  }),
  explore: defineCommand({
    name: "explore",
    schema: summaryOptionsSchema,
    usage: "espalier explore INPUT [NEW]",
    summary: "look around interactively: the view re-fits the terminal on every key",
    args: ["input", "[new]"],
    examples: [
      {
        what: "Look around the org chart; h lists the keys, q leaves, p leaves printing the view's command line",
        line: "espalier explore fixtures/quillfeather-org.csv --parent-field manager --label '{name}, {title}'",
      },
      {
        what: "Step through what changed (the changes are the foci; n and N move between them)",
        line: "grep -v 'services/ledger/test' fixtures/tidewater-files.paths | espalier explore fixtures/tidewater-files.paths -",
      },
    ],
    notes:
      "It needs a terminal; keys come from the terminal even when standard input holds a version. " +
      `${printedOptionNames()} belong to printed summaries and are not taken.`,
    exitStatus: [
      [0, "left with q or p"],
      [2, "a usage or input error (nothing drawn)"],
      [130, "left with Ctrl-C"],
    ],
    run: async (args, options, io, sources) =>
      (await import("./explore-command.js")).exploreCommand(args[0], args[1], options, io, {
        configFile: sources.configFile,
        configSetsImportance: sources.fromConfig.has("importance"),
      }),
  }),
};

/** The options explore does not take, as `--budget, --format … and --sibling-order` (from options.ts). */
function printedOptionNames(): string {
  const names = [...printedOnly].map(
    (key) => optionFlags(key, sharedOptions[key as keyof typeof sharedOptions]).long,
  );
  return `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}
