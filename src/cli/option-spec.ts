import type { MayBeAbsent, OptionValue, ValueOf } from "./option-value.js";

/**
 * The groups options are listed in, in order: docs/cli.md has one section per group (the heading is the
 * group's name) and `--help` prints the same groups.
 */
export const optionGroups = [
  "Focus",
  "Budget and layout",
  "Output",
  "Input",
  "Fact tables",
  "Diff only",
  "Config file",
  "Help",
] as const;
export type OptionGroup = (typeof optionGroups)[number];

/**
 * One option, declared once. Everything else is derived from it: the argument parser, `--help`, the
 * check of a run's values (option-value.ts), the zod schemas of the config file and its JSON Schema
 * (option-schema.ts, config-schema.ts), and the check that docs/cli.md documents it.
 */
export interface OptionSpec {
  /**
   * As written on the command line and in the docs: an optional one-letter name, the long name and the
   * value's name in angle brackets (`-f, --focus <path>`); a switch has no value. A switch sets the
   * opposite of its default (`--no-chains` sets `chains` to false).
   */
  flags: string;
  /** The value after parsing: its type and default (option-value.ts). */
  value: OptionValue;
  /** One line of help. */
  help: string;
  group: OptionGroup;
  /** Whether a config file may set it: no for options naming this run's own files. Default yes. */
  config?: boolean;
}

/** The checked values of a table of options: an option with no default may be absent. */
export type OptionsOf<T extends Record<string, OptionSpec>> = {
  [K in keyof T as MayBeAbsent<T[K]["value"]> extends true ? never : K]: ValueOf<T[K]["value"]>;
} & {
  [K in keyof T as MayBeAbsent<T[K]["value"]> extends true ? K : never]?: ValueOf<T[K]["value"]>;
};
