import type { z } from "zod";
import { didYouMeanText } from "../did-you-mean.js";
import { EspalierError, type SourcePos } from "../errors.js";
import type { OptionSpec, OptionsOf } from "./option-spec.js";
import { checkValue, quote } from "./option-value.js";

/**
 * One line for a zod issue about one option, `name` being how the user wrote it (`--format`, or
 * `config key format`). A bad value is quoted as the user gave it.
 */
export function issueMessage(issue: z.core.$ZodIssue, name: string, given: unknown): string {
  const got = "input" in issue && issue.input !== undefined ? issue.input : given;
  if (issue.code === "invalid_value") {
    const choices = issue.values.map(String);
    const typed = String(got);
    return `${name} must be one of ${choices.join(", ")}, not ${quote(got)}${didYouMeanText(typed, choices)}`;
  }
  if (issue.code === "too_small" && issue.origin === "string") return `${name} must not be empty`;
  if (issue.code === "invalid_type" && !issue.message.startsWith("Invalid input")) {
    return `${name} ${issue.message}`;
  }
  if (issue.code === "invalid_type") return `${name} must be ${article(issue.expected)}, not ${quote(got)}`;
  if (issue.message.startsWith("must ")) return `${name} ${issue.message}`;
  return `${name}: ${issue.message}`;
}

/**
 * Checks the options a command runs with against their declarations (`table`, in its order: the first
 * bad value is reported) and gives the values to run with, defaults filled in; keys the table does not
 * declare are left out. A bad value is a USAGE error naming the option as the user wrote it (the flag,
 * or the config file's key with its line and column).
 */
export function validateOptions<T extends Record<string, OptionSpec>>(
  table: T,
  values: Record<string, unknown>,
  nameOf: (key: string) => { name: string; pos?: SourcePos },
): OptionsOf<T> {
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(table)) {
    const checked = checkValue(table[key].value, values[key]);
    if (!checked.ok) {
      const { name, pos } = nameOf(key);
      throw new EspalierError("USAGE", checked.message(name), pos, { option: name });
    }
    if (checked.value !== undefined) out[key] = checked.value;
  }
  return out as OptionsOf<T>;
}

function article(type: string): string {
  if (type === "array") return "a list";
  if (type === "object") return "a mapping";
  return /^[aeiou]/.test(type) ? `an ${type}` : `a ${type}`;
}
