import { didYouMeanText } from "../did-you-mean.js";

// What one option's value may be, as plain data: the option table (options.ts) declares each option's
// value with the builders below. Checking a run's values is a few comparisons per option, done here by
// hand; the zod schemas of the same declarations (option-schema.ts) are made only for a config file and
// the published JSON Schema, since making them was a good part of a small run's start (issue 14).
// tests/cli/option-value.test.ts holds this checker to those zod schemas over random values.

/** A switch: true or false, with its value when not given. */
export interface FlagValue {
  kind: "flag";
  default: boolean;
}

/** Any text; `nonEmpty` refuses "". */
export interface TextValue<D extends string | undefined = string | undefined> {
  kind: "text";
  nonEmpty: boolean;
  default: D;
}

/** One of a fixed list of words. */
export interface ChoiceValue<C extends string = string, D extends C | undefined = C | undefined> {
  kind: "choice";
  choices: readonly C[];
  default: D;
}

/** A whole number of at least 1 (digits only when given as text); no value when not given. */
export interface CountValue {
  kind: "count";
  default: undefined;
}

/** A repeatable option's texts, [] when not given; `max` bounds how many, with its own message. */
export interface ListValue {
  kind: "list";
  nonEmpty: boolean;
  max: { count: number; message: string } | undefined;
  default: readonly [];
}

export type OptionValue = FlagValue | TextValue | ChoiceValue | CountValue | ListValue;

/** A switch, `value` when not given (given, it sets the opposite). */
export function flag(value: boolean): FlagValue {
  return { kind: "flag", default: value };
}

/** Text, absent when not given. */
export function text(opts?: { nonEmpty?: boolean }): TextValue<undefined>;
/** Text, `default` when not given. */
export function text(opts: { nonEmpty?: boolean; default: string }): TextValue<string>;
export function text(opts: { nonEmpty?: boolean; default?: string } = {}): TextValue {
  return { kind: "text", nonEmpty: opts.nonEmpty === true, default: opts.default };
}

/** One of `choices`, absent when not given. */
export function choice<const C extends string>(choices: readonly C[]): ChoiceValue<C, undefined>;
/** One of `choices`, `value` when not given. */
export function choice<const C extends string>(choices: readonly C[], value: C): ChoiceValue<C, C>;
export function choice<const C extends string>(choices: readonly C[], value?: C): ChoiceValue<C> {
  return { kind: "choice", choices, default: value };
}

/** A whole number of at least 1, absent when not given. */
export function count(): CountValue {
  return { kind: "count", default: undefined };
}

/** Texts of a repeatable option. */
export function list(opts: { nonEmpty?: boolean; max?: { count: number; message: string } } = {}): ListValue {
  return { kind: "list", nonEmpty: opts.nonEmpty === true, max: opts.max, default: [] };
}

/** The type a checked value has. */
export type ValueOf<V extends OptionValue> = V extends FlagValue
  ? boolean
  : V extends TextValue<infer D>
    ? D extends string
      ? string
      : string | undefined
    : V extends ChoiceValue<infer C, infer D>
      ? D extends C
        ? C
        : C | undefined
      : V extends CountValue
        ? number | undefined
        : string[];

/** Whether a checked value may be absent (no default). */
export type MayBeAbsent<V extends OptionValue> = undefined extends ValueOf<V> ? true : false;

/** The result of checking one value: the value to run with, or why it is refused. */
export type Checked = { ok: true; value: unknown } | { ok: false; message: (name: string) => string };

const DIGITS = /^[0-9]+$/;

/**
 * Checks one option's value (`undefined`: not given) and gives the value to run with: the default when
 * not given, a count given as digits as a number, a list as a new array. A refusal says why in one line
 * naming the option as the user wrote it; a bad value is quoted as given.
 */
export function checkValue(spec: OptionValue, input: unknown): Checked {
  if (input === undefined) return { ok: true, value: spec.kind === "list" ? [] : spec.default };
  switch (spec.kind) {
    case "flag":
      return typeof input === "boolean" ? { ok: true, value: input } : mustBe("a boolean", input);
    case "text":
      if (typeof input !== "string") return mustBe("a string", input);
      return spec.nonEmpty && input === ""
        ? refuse((name) => `${name} must not be empty`)
        : { ok: true, value: input };
    case "choice":
      return (spec.choices as readonly unknown[]).includes(input)
        ? { ok: true, value: input }
        : refuse(
            (name) =>
              `${name} must be one of ${spec.choices.join(", ")}, not ${quote(input)}${didYouMeanText(String(input), spec.choices)}`,
          );
    case "count":
      return checkCount(input);
    case "list": {
      if (!Array.isArray(input)) return mustBe("a list", input);
      const max = spec.max;
      if (max && input.length > max.count) return refuse((name) => `${name}: ${max.message}`);
      for (const item of input) {
        if (typeof item !== "string") return mustBe("a string", input);
        if (spec.nonEmpty && item === "") return refuse((name) => `${name} must not be empty`);
      }
      return { ok: true, value: [...input] };
    }
  }
}

function checkCount(input: unknown): Checked {
  // Digits are read as a number only while it is exact (below 2^53).
  const value =
    typeof input === "string" && DIGITS.test(input) && Number.isSafeInteger(Number(input))
      ? Number(input)
      : input;
  if (typeof value === "string" && DIGITS.test(value))
    return refuse((name) => `${name} must be at most ${Number.MAX_SAFE_INTEGER}, not ${quote(value)}`);
  if (typeof value !== "number" || !Number.isSafeInteger(value))
    return refuse((name) => `${name} must be a whole number, not ${plain(value)}`);
  if (value <= 0) return refuse((name) => `${name} must be at least 1, not ${plain(value)}`);
  return { ok: true, value };
}

function mustBe(what: string, input: unknown): Checked {
  return refuse((name) => `${name} must be ${what}, not ${quote(input)}`);
}

function refuse(message: (name: string) => string): Checked {
  return { ok: false, message };
}

/** A value as a message shows it: text in quotes, lists and mappings as JSON. */
export function quote(value: unknown): string {
  if (typeof value === "string") return JSON.stringify(value);
  if (value === undefined) return "nothing";
  return typeof value === "object" ? JSON.stringify(value) : String(value);
}

/** Text in quotes, anything else as String() writes it. */
function plain(value: unknown): string {
  return typeof value === "string" ? JSON.stringify(value) : String(value);
}
