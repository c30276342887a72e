import { didYouMean } from "../did-you-mean.js";
import { EspalierError } from "../errors.js";
import { type OptionFlags, optionFlags } from "./option-flags.js";
import { allOptions, type CommandName, commandNames, commandOptions } from "./options.js";

/** What the command line says, before any config file or validation. */
export interface CommandLine {
  command: CommandName;
  /** The arguments that are not options, the command's name left out. */
  args: string[];
  /**
   * The options given, by key: a string for an option with a value, an array of strings for a
   * repeatable one, true/false for a switch. Options not given are absent.
   */
  given: Record<string, unknown>;
}

/** Every option's flags, by key, read once. */
export const flagsByKey: ReadonlyMap<string, OptionFlags> = new Map(
  Object.entries(allOptions).map(([key, spec]) => [key, optionFlags(key, spec)]),
);
const byName = new Map<string, OptionFlags>();
for (const flags of flagsByKey.values()) {
  byName.set(flags.long, flags);
  if (flags.short) byName.set(flags.short, flags);
}

/**
 * Reads argv (without node and the script). The first argument that is not an option may name a
 * command (`diff`); options may come anywhere, before or after the command's name, and apply to the
 * command either way. `--` ends the options. An unknown option, a missing value, a switch given a value,
 * an option the command does not take, or one option given twice with different values is a USAGE
 * error naming it: nothing on the command line is ever silently dropped.
 */
export function parseCommandLine(argv: readonly string[]): CommandLine {
  let command: CommandName = "summary";
  const args: string[] = [];
  const given: Record<string, unknown> = {};
  const typed = new Map<string, string>(); // key -> the flag as typed, for messages
  let sawArgument = false;

  const positional = (arg: string, literal = false) => {
    if (!literal && !sawArgument && isCommand(arg)) command = arg;
    else args.push(arg);
    sawArgument = true;
  };
  const set = (flags: OptionFlags, as: string, value: string | boolean) => {
    typed.set(flags.key, as);
    if (flags.repeatable) {
      given[flags.key] = [...((given[flags.key] as string[] | undefined) ?? []), value];
      return;
    }
    const before = given[flags.key];
    if (before !== undefined && before !== value) {
      throw usage(`${as} is given twice (${show(before)} and ${show(value)}); give it once`, {
        option: flags.long,
      });
    }
    given[flags.key] = value;
  };

  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--") {
      // After "--" everything is an argument, even a file called "diff".
      for (const rest of argv.slice(i + 1)) positional(rest, true);
      break;
    }
    if (arg === "-" || !arg.startsWith("-")) {
      positional(arg);
      continue;
    }
    let name: string;
    let inline: string | undefined;
    if (arg.startsWith("--")) {
      const eq = arg.indexOf("=");
      name = eq < 0 ? arg : arg.slice(0, eq);
      inline = eq < 0 ? undefined : arg.slice(eq + 1);
    } else {
      // -b30 is -b 30; one-letter switches may be grouped (-xy is -x -y).
      name = arg.slice(0, 2);
      inline = arg.length > 2 ? arg.slice(2) : undefined;
    }
    const flags = byName.get(name);
    if (!flags) throw unknownOption(name, command);
    if (flags.switchValue !== undefined) {
      if (inline !== undefined && arg.startsWith("--"))
        throw usage(`${flags.long} takes no value (given ${JSON.stringify(inline)})`, { option: flags.long });
      set(flags, name, flags.switchValue);
      if (inline !== undefined) {
        // Grouped one-letter switches.
        for (const letter of inline) {
          const next = byName.get(`-${letter}`);
          if (!next) throw unknownOption(`-${letter}`, command);
          if (next.switchValue === undefined)
            throw usage(`${next.short} takes a value; give it on its own`, { option: next.long });
          set(next, `-${letter}`, next.switchValue);
        }
      }
      continue;
    }
    let value = inline;
    if (value === undefined) {
      const next = argv[i + 1];
      // A value may begin with "-" (a negative number, "-" for standard input), not with "--".
      if (next === undefined || next.startsWith("--")) {
        throw usage(
          `${name} needs a value (${flags.valueName?.toUpperCase()})${next === undefined ? "" : `; to give one that begins with "--", write ${flags.long}=${next}`}`,
          { option: flags.long },
        );
      }
      value = next;
      i++;
    }
    set(flags, name, value);
  }

  const takes = commandOptions[command];
  for (const key of Object.keys(given)) {
    if (!(key in takes)) {
      const owner = commandNames.find((c) => key in commandOptions[c]);
      throw usage(
        `${typed.get(key)} belongs to espalier ${owner === "summary" ? "INPUT" : owner}, not to ${commandLabel(command)}`,
        { option: flagsByKey.get(key)!.long },
      );
    }
  }
  return { command, args, given };
}

function isCommand(arg: string): arg is CommandName {
  return arg !== "summary" && (commandNames as readonly string[]).includes(arg);
}

/** `espalier diff`, or `espalier INPUT` for the summary. */
export function commandLabel(command: CommandName): string {
  return command === "summary" ? "espalier INPUT" : `espalier ${command}`;
}

/**
 * USAGE for an option no command has, naming the help that lists the options of `command` (the command
 * named so far: `espalier diff --exit-code` points at `espalier diff --help`, whose options the summary's
 * help does not list).
 */
function unknownOption(name: string, command: CommandName): EspalierError {
  const suggestion = didYouMean(
    name,
    [...flagsByKey.values()].map((f) => f.long),
  );
  const help = command === "summary" ? "espalier --help" : `espalier ${command} --help`;
  return usage(
    `unknown option ${name}${suggestion === undefined ? "" : `; did you mean ${suggestion}?`} (${help} lists them)`,
    suggestion === undefined ? { option: name } : { option: name, suggestion },
  );
}

function show(value: unknown): string {
  return typeof value === "string" ? JSON.stringify(value) : String(value);
}

function usage(message: string, details: Record<string, string>): EspalierError {
  return new EspalierError("USAGE", message, undefined, details);
}
