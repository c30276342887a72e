import * as z from "zod";
import { importances } from "../interest/importance.js";
import { inputFormats } from "../load/load-options.js";

/** Input formats on the command line: the tree formats, and the formats only fact tables come in. */
export const cliInputFormats = [...inputFormats, "jsonl", "parquet"] as const;

/** Output formats of a summary. */
export const outputFormats = ["text", "json", "markdown", "svg"] as const;

const positiveInt = (what: string) =>
  z.coerce
    .number({ error: `${what} must be a whole number` })
    .int(`${what} must be a whole number`)
    .positive(`${what} must be at least 1`);

/**
 * Every option of a summary, declared once: type, default and meaning. The CLI parses argv with
 * commander, then validates here; the core only ever sees the parsed result.
 */
export const summaryOptionsSchema = z.object({
  focus: z.array(z.string()).default([]).describe("Focus path, id or glob; repeatable."),
  focusFrom: z.string().optional().describe("Read more foci from a file, one per line ('-' = stdin)."),
  budget: positiveInt("--budget").optional().describe("Line budget (default: terminal height, else 40)."),
  format: z.enum(outputFormats).default("text").describe("Output format."),
  inputFormat: z.enum(cliInputFormats).optional().describe("Input format (default: detected)."),
  nameField: z.string().min(1).default("name").describe("Field holding a node's name."),
  childrenField: z.string().min(1).default("children").describe("Field holding a node's children."),
  sizeField: z.string().min(1).default("size").describe("Field holding a node's own size."),
  idField: z.string().min(1).default("id").describe("Column holding a row's id."),
  parentField: z.string().min(1).default("parent").describe("Column holding the parent's id."),
  pathField: z.string().min(1).default("path").describe("Column holding a row's path."),
  importance: z.enum(importances).default("depth").describe("A-priori importance: depth or size."),
  units: z.enum(["auto", "bytes", "plain"]).default("auto").describe("How sizes print."),
  label: z.string().optional().describe("Label template, e.g. '{title}, {team}'."),
  pseudonymize: z.boolean().default(false).describe("Print keyed pseudonyms instead of names."),
  chains: z.boolean().default(true).describe("Print a run of only children as one line."),
  width: positiveInt("--width").optional().describe("Widest line in columns (default: terminal width)."),
  color: z.enum(["auto", "always", "never"]).default("auto").describe("Colour in text output."),
  levels: z
    .string()
    .min(1)
    .optional()
    .describe("Fact table: level columns, outermost first, comma-separated (account,service,region)."),
  keyField: z.string().min(1).optional().describe("Fact table: a key column split into levels."),
  keySeparator: z.string().min(1).default("/").describe("What --key-field values are split on."),
  keyDepth: positiveInt("--key-depth")
    .optional()
    .describe("Deepest key level to roll up (default: the deepest)."),
  rolledUp: z.boolean().default(false).describe("The input is the result table of the --print-sql query."),
  printSql: z.boolean().default(false).describe("Print the rollup query in standard SQL and stop."),
  sqlTable: z.string().min(1).default("facts").describe("Table name in the --print-sql query."),
  maxNodes: positiveInt("--max-nodes").optional().describe("Refuse inputs with more nodes than this."),
  output: z.string().min(1).optional().describe("Write to this file (whole or not at all), not stdout."),
});

export type SummaryCliOptions = z.infer<typeof summaryOptionsSchema>;

/** Environment variable holding the secret for --pseudonymize. */
export const PSEUDONYM_KEY_ENV = "ESPALIER_PSEUDONYM_KEY";

/** Budget when printing to something that is not a terminal. */
export const DEFAULT_BUDGET = 40;
