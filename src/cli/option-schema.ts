import * as z from "zod";
import type { OptionValue } from "./option-value.js";
import type { OptionSpec } from "./options.js";

// The zod schemas of the option declarations: a config file is checked with them, and they give the
// published JSON Schema of the config (config-schema.ts). A run without a config file never loads this
// module (start-up, issue 14); its values are checked by option-value.ts, which the tests hold to these
// schemas. Options are validated once a run: zod's compiled fast path (generated code, made on first
// use) costs more than it saves there. Set before any schema below is made.
z.config({ jitless: true });

const DIGITS = /^[0-9]+$/;

/** The zod schema of one option: its type, default and one line of help (`.describe()`). */
export function optionSchema(spec: OptionSpec): z.ZodType {
  return schemaOf(spec.value).describe(spec.help);
}

function schemaOf(value: OptionValue): z.ZodType {
  switch (value.kind) {
    case "flag":
      return z.boolean().default(value.default);
    case "text": {
      const text = value.nonEmpty ? z.string().min(1) : z.string();
      return value.default === undefined ? text.optional() : text.default(value.default);
    }
    case "choice": {
      const choice = z.enum(value.choices as [string, ...string[]]);
      return value.default === undefined ? choice.optional() : choice.default(value.default);
    }
    case "count":
      return wholeNumber().optional();
    case "list": {
      const items = z.array(value.nonEmpty ? z.string().min(1) : z.string());
      return (value.max ? items.max(value.max.count, { error: value.max.message }) : items).default([]);
    }
  }
}

/** A count of at least 1; from the command line, digits only ("0x10", "1e3", " 12" are refused). */
function wholeNumber() {
  return z.preprocess(
    (v) => (typeof v === "string" && DIGITS.test(v) && Number.isSafeInteger(Number(v)) ? Number(v) : v),
    z
      .number({
        error: (issue) =>
          typeof issue.input === "string" && DIGITS.test(issue.input)
            ? `must be at most ${Number.MAX_SAFE_INTEGER}, not ${quote(issue.input)}`
            : `must be a whole number, not ${quote(issue.input)}`,
      })
      .int()
      .positive({ error: (issue) => `must be at least 1, not ${quote(issue.input)}` }),
  );
}

function quote(value: unknown): string {
  return typeof value === "string" ? JSON.stringify(value) : String(value);
}

/** The zod object of a table of options (every option's schema under its key). */
export function optionsObjectSchema(table: Record<string, OptionSpec>): z.ZodObject {
  const shape: Record<string, z.ZodType> = {};
  for (const [key, spec] of Object.entries(table)) shape[key] = optionSchema(spec);
  return z.object(shape);
}
