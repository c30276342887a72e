import type { z } from "zod";
import { didYouMeanText } from "../did-you-mean.js";
import { EspalierError, type SourcePos } from "../errors.js";

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
 * Validates the options a command runs with; a bad value is a USAGE error naming the option as the user
 * wrote it (the flag, or the config file's key with its line and column).
 */
export function validateOptions<S extends z.ZodType>(
  schema: S,
  values: Record<string, unknown>,
  nameOf: (key: string) => { name: string; pos?: SourcePos },
): z.infer<S> {
  const parsed = schema.safeParse(values);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0];
  const key = String(issue.path[0]);
  const { name, pos } = nameOf(key);
  throw new EspalierError("USAGE", issueMessage(issue, name, values[key]), pos, { option: name });
}

function quote(value: unknown): string {
  if (typeof value === "string") return JSON.stringify(value);
  if (value === undefined) return "nothing";
  return typeof value === "object" ? JSON.stringify(value) : String(value);
}

function article(type: string): string {
  if (type === "array") return "a list";
  if (type === "object") return "a mapping";
  return /^[aeiou]/.test(type) ? `an ${type}` : `a ${type}`;
}
