import type { z } from "zod";
import type { OptionSpec } from "./options.js";

/** An option's flags taken apart, and what its schema says about the value. */
export interface OptionFlags {
  key: string;
  /** `--focus`. */
  long: string;
  /** `-f`, when it has one. */
  short: string | undefined;
  /** `path` in `<path>`; undefined for a switch. */
  valueName: string | undefined;
  /** Given more than once, its values are collected (an array schema). */
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

/** Reads `-f, --focus <path>` and the schema's type, default, choices and description. */
export function optionFlags(key: string, spec: OptionSpec): OptionFlags {
  const m = FLAGS.exec(spec.flags);
  if (!m) throw new Error(`option ${key}: flags ${JSON.stringify(spec.flags)} are not "-x, --name <value>"`);
  const [, short, long, valueName] = m;
  const inner = unwrap(spec.schema);
  const defaultValue = defaultOf(spec.schema);
  const isSwitch = inner.type === "boolean";
  if (isSwitch !== (valueName === undefined))
    throw new Error(`option ${key}: a boolean is a switch (no <value>), anything else takes a value`);
  return {
    key,
    long: `--${long}`,
    short: short === undefined ? undefined : `-${short}`,
    valueName,
    repeatable: inner.type === "array",
    switchValue: isSwitch ? defaultValue !== true : undefined,
    choices: inner.type === "enum" ? (inner as z.ZodEnum).options.map(String) : undefined,
    defaultValue,
    help: spec.schema.description ?? "",
  };
}

/** The schema under optional/default/preprocess wrappers. */
function unwrap(schema: z.ZodType): z.ZodType {
  let s = schema;
  for (;;) {
    const def = s.def as { type: string; innerType?: z.ZodType; out?: z.ZodType };
    if ((def.type === "optional" || def.type === "default") && def.innerType) s = def.innerType;
    else if (def.type === "pipe" && def.out) s = def.out;
    else return s;
  }
}

function defaultOf(schema: z.ZodType): unknown {
  let s = schema;
  for (;;) {
    const def = s.def as { type: string; innerType?: z.ZodType; defaultValue?: unknown };
    if (def.type === "default") return def.defaultValue;
    if (def.type === "optional" && def.innerType) s = def.innerType;
    else return undefined;
  }
}
