import type { OptionSpec } from "./options.js";

/** An option's flags taken apart, and what its declaration says about the value. */
export interface OptionFlags {
  key: string;
  /** `--focus`. */
  long: string;
  /** `-f`, when it has one. */
  short: string | undefined;
  /** `path` in `<path>`; undefined for a switch. */
  valueName: string | undefined;
  /** Given more than once, its values are collected (a list). */
  repeatable: boolean;
  /** A switch sets this value (the opposite of its default); undefined for an option with a value. */
  switchValue: boolean | undefined;
  /** The values an option with a fixed list accepts. */
  choices: readonly string[] | undefined;
  /** The default shown in help; undefined when there is none. */
  defaultValue: unknown;
  /** One line of help. */
  help: string;
}

const FLAGS = /^(?:-([A-Za-z]), )?--([a-z][a-z-]*)(?: <([a-z-]+)>)?$/;

/** Reads `-f, --focus <path>` and the declared value's type, default, choices, and the help line. */
export function optionFlags(key: string, spec: OptionSpec): OptionFlags {
  const m = FLAGS.exec(spec.flags);
  if (!m) throw new Error(`option ${key}: flags ${JSON.stringify(spec.flags)} are not "-x, --name <value>"`);
  const [, short, long, valueName] = m;
  const { value } = spec;
  const isSwitch = value.kind === "flag";
  if (isSwitch !== (valueName === undefined))
    throw new Error(`option ${key}: a boolean is a switch (no <value>), anything else takes a value`);
  return {
    key,
    long: `--${long}`,
    short: short === undefined ? undefined : `-${short}`,
    valueName,
    repeatable: value.kind === "list",
    switchValue: isSwitch ? value.default !== true : undefined,
    choices: value.kind === "choice" ? value.choices.map(String) : undefined,
    defaultValue: value.kind === "list" ? [] : value.default,
    help: spec.help,
  };
}
