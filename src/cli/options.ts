import * as z from "zod";
import { unmatchedFociChoices } from "../focus/focus-spec.js";
import { importances } from "../interest/importance.js";
import { inputFormats } from "../load/load-options.js";
import { siblingOrders } from "../view/sibling-order.js";

// Options are validated once a run: zod's compiled fast path (generated code, made on first use) costs
// more than it saves there (start-up, issue 14). Set before any schema below is made.
z.config({ jitless: true });

/** Input formats on the command line: the tree formats, and the formats only fact tables come in. */
export const cliInputFormats = [...inputFormats, "jsonl", "parquet"] as const;

/** Output formats of a summary and of a diff. */
export const outputFormats = ["text", "json", "markdown", "svg"] as const;
export type OutputFormat = (typeof outputFormats)[number];
/** When text output is coloured. */
export const colorModes = ["auto", "always", "never"] as const;
/** How sizes print. */
export const unitModes = ["auto", "bytes", "plain"] as const;
/** What a node's share (in percent) is of: nothing printed, the whole tree, the line above. */
export const shareChoices = ["none", "total", "parent"] as const;

/** When a fact table's rollup is fetched only as deep as the summary reaches. */
export const pushdownModes = ["auto", "always", "never"] as const;

/** The commands of the command line. */
export const commandNames = ["summary", "diff", "explore"] as const;
export type CommandName = (typeof commandNames)[number];

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
 * validated shape (a zod object of every option's `schema`), the config file's schema, and the check
 * that docs/cli.md documents it.
 */
export interface OptionSpec {
  /**
   * As written on the command line and in the docs: an optional one-letter name, the long name and the
   * value's name in angle brackets (`-f, --focus <path>`); a switch has no value. A switch sets the
   * opposite of its default (`--no-chains` sets `chains` to false).
   */
  flags: string;
  /** The value after parsing: type, default and the one-line help (`.describe()`). */
  schema: z.ZodType;
  group: OptionGroup;
  /** Whether a config file may set it: no for options naming this run's own files. Default yes. */
  config?: boolean;
}

const DIGITS = /^[0-9]+$/;

/** A count of at least 1; from the command line, digits only ("0x10", "1e3", " 12" are refused). */
const wholeNumber = () =>
  z.preprocess(
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

function quote(value: unknown): string {
  return typeof value === "string" ? JSON.stringify(value) : String(value);
}

/**
 * Options of every command (summary and diff). To add an option: add one entry here (or in
 * {@link summaryOnlyOptions} / {@link diffOnlyOptions}) and one row in docs/cli.md's section for its
 * group; the parser, `--help`, the config schema and the validated options follow.
 */
export const sharedOptions = {
  focus: {
    flags: "-f, --focus <path>",
    group: "Focus",
    schema: z
      .array(z.string())
      .default([])
      .describe("a node to show with its context: path, row id or glob; repeatable"),
  },
  focusFrom: {
    flags: "--focus-from <file>",
    group: "Focus",
    config: false,
    schema: z.string().optional().describe("more foci from a file, one per line (- for standard input)"),
  },
  unmatchedFoci: {
    flags: "--unmatched-foci <choice>",
    group: "Focus",
    schema: z
      .enum(unmatchedFociChoices)
      .default("error")
      .describe("a focus that matches no node: error, or skip it (listed on standard error and in JSON)"),
  },
  budget: {
    flags: "-b, --budget <lines>",
    group: "Budget and layout",
    schema: wholeNumber().optional().describe("most lines to print (default: terminal height, else 40)"),
  },
  width: {
    flags: "--width <columns>",
    group: "Budget and layout",
    schema: wholeNumber().optional().describe("widest line, in terminal columns (default: terminal width)"),
  },
  chains: {
    flags: "--no-chains",
    group: "Budget and layout",
    schema: z
      .boolean()
      .default(true)
      .describe("a run of only children shares one line; --no-chains gives every node its own"),
  },
  importance: {
    flags: "--importance <kind>",
    group: "Budget and layout",
    schema: z
      .enum(importances)
      .default("depth")
      .describe("a-priori importance: depth, or size (bigger subtrees matter more)"),
  },
  format: {
    flags: "--format <format>",
    group: "Output",
    schema: z.enum(outputFormats).default("text").describe("what to print"),
  },
  output: {
    flags: "-o, --output <file>",
    group: "Output",
    config: false,
    schema: z
      .string()
      .min(1)
      .optional()
      .describe("write to this file, whole or not at all, instead of standard output"),
  },
  units: {
    flags: "--units <units>",
    group: "Output",
    schema: z
      .enum(unitModes)
      .default("auto")
      .describe(
        "sizes as bytes (KiB, MiB) or plain numbers; auto: bytes for file sizes and a document's bytes",
      ),
  },
  label: {
    flags: "--label <template>",
    group: "Output",
    schema: z
      .string()
      .optional()
      .describe("the text of each node from record fields, e.g. '{title}, {team}'"),
  },
  pseudonymize: {
    flags: "--pseudonymize",
    group: "Output",
    schema: z
      .boolean()
      .default(false)
      .describe("print keyed pseudonyms instead of names and ids (secret in ESPALIER_PSEUDONYM_KEY)"),
  },
  bare: {
    flags: "--bare",
    group: "Budget and layout",
    schema: z.boolean().default(false).describe("print no header line, only the tree's lines (for scripts)"),
  },
  legend: {
    flags: "--legend",
    group: "Budget and layout",
    schema: z
      .boolean()
      .default(false)
      .describe("print what the marks and numbers mean under the header (the budget counts it)"),
  },
  share: {
    flags: "--share <of>",
    group: "Output",
    schema: z
      .enum(shareChoices)
      .default("none")
      .describe("add each node's share in percent: of the total, or of the line above"),
  },
  siblingOrder: {
    flags: "--sibling-order <order>",
    group: "Output",
    schema: z
      .enum(siblingOrders)
      .default("input")
      .describe("order of shown siblings: input, size (biggest first) or name"),
  },
  color: {
    flags: "--color <when>",
    group: "Output",
    schema: z.enum(colorModes).default("auto").describe("colour in text output"),
  },
  inputFormat: {
    flags: "--input-format <format>",
    group: "Input",
    schema: z.enum(cliInputFormats).optional().describe("input format (default: detected)"),
  },
  nameField: {
    flags: "--name-field <field>",
    group: "Input",
    schema: z.string().min(1).default("name").describe("field holding a node's name"),
  },
  childrenField: {
    flags: "--children-field <field>",
    group: "Input",
    schema: z.string().min(1).default("children").describe("field holding a node's children"),
  },
  readAs: {
    flags: "--read-as <reading>",
    group: "Input",
    schema: z
      .enum(["auto", "nodes", "values"])
      .default("auto")
      .describe("JSON/YAML: node objects, or every value a node sized in bytes; auto: by the document"),
  },
  nulSeparated: {
    flags: "--nul-separated",
    group: "Input",
    schema: z
      .boolean()
      .default(false)
      .describe("path lists: entries end with a NUL byte (find -print0, git ls-files -z)"),
  },
  sizeField: {
    flags: "--size-field <field>",
    group: "Input",
    schema: z.string().min(1).default("size").describe("field holding a node's own size"),
  },
  idField: {
    flags: "--id-field <column>",
    group: "Input",
    schema: z.string().min(1).default("id").describe("column holding a row's id"),
  },
  parentField: {
    flags: "--parent-field <column>",
    group: "Input",
    schema: z.string().min(1).default("parent").describe("column holding the parent row's id"),
  },
  pathField: {
    flags: "--path-field <column>",
    group: "Input",
    schema: z.string().min(1).default("path").describe("column holding a row's full path"),
  },
  childField: {
    flags: "--child-field <column>",
    group: "Input",
    schema: z.string().min(1).default("child").describe("column holding an edge's child id (edge tables)"),
  },
  graph: {
    flags: "--graph",
    group: "Input",
    schema: z
      .boolean()
      .default(false)
      .describe("read the input as a graph: ids may repeat with other parents; a JSON/YAML object maps ids"),
  },
  nodes: {
    flags: "--nodes <file>",
    group: "Input",
    config: false,
    schema: z
      .array(z.string().min(1))
      .max(2, { error: "is given at most twice: once for both versions, or OLD's then NEW's" })
      .default([])
      .describe(
        "node records of a graph by id (names, sizes, fields) from this CSV/TSV/JSON table; comparing two versions: once for both, or twice (OLD's, then NEW's)",
      ),
  },
  maxNodes: {
    flags: "--max-nodes <count>",
    group: "Input",
    schema: wholeNumber().optional().describe("refuse inputs with more nodes than this"),
  },
  levels: {
    flags: "--levels <columns>",
    group: "Fact tables",
    schema: z
      .string()
      .min(1)
      .optional()
      .describe("level columns, outermost first, comma-separated (account,service,region)"),
  },
  keyField: {
    flags: "--key-field <column>",
    group: "Fact tables",
    schema: z.string().min(1).optional().describe("a key column split into levels"),
  },
  keySeparator: {
    flags: "--key-separator <text>",
    group: "Fact tables",
    schema: z.string().min(1).default("/").describe("what --key-field values are split on"),
  },
  keyDepth: {
    flags: "--key-depth <levels>",
    group: "Fact tables",
    schema: wholeNumber()
      .optional()
      .describe("deepest key level to roll up (default: the deepest in the table)"),
  },
  sqlTable: {
    flags: "--sql-table <name>",
    group: "Fact tables",
    schema: z.string().min(1).default("facts").describe("table name in the --print-sql query"),
  },
  pushdown: {
    flags: "--pushdown <when>",
    group: "Fact tables",
    schema: z
      .enum(pushdownModes)
      .default("auto")
      .describe("fetch a big rollup only as deep as the summary reaches (auto: past 1,000,000 rows)"),
  },
  rolledUp: {
    flags: "--rolled-up",
    group: "Fact tables",
    schema: z
      .boolean()
      .default(false)
      .describe("the input is the result table of the --print-sql query, run elsewhere"),
  },
} satisfies Record<string, OptionSpec>;

/** Options of a summary only. */
export const summaryOnlyOptions = {
  printSql: {
    flags: "--print-sql",
    group: "Fact tables",
    config: false,
    schema: z
      .boolean()
      .default(false)
      .describe("print the rollup plan the engine runs as one standard SQL query, and stop"),
  },
  sqlReach: {
    flags: "--sql-reach <levels>",
    group: "Fact tables",
    schema: wholeNumber()
      .optional()
      .describe("with --print-sql and foci: a pushdown query, only nodes this near the focus paths"),
  },
} satisfies Record<string, OptionSpec>;

/** Options of `espalier diff` only. */
export const diffOnlyOptions = {
  failOnChange: {
    flags: "--fail-on-change",
    group: "Diff only",
    schema: z
      .boolean()
      .default(false)
      .describe("exit with status 1 when the versions differ (0 when they are the same, 2 on an error)"),
  },
  compareField: {
    flags: "--compare-field <field>",
    group: "Diff only",
    schema: z
      .array(z.string().min(1))
      .default([])
      .describe(
        "a record field compared between matched nodes; a new value is a change (edited); repeatable",
      ),
  },
} satisfies Record<string, OptionSpec>;

/** Options that steer the run itself (config file, help): never in a config file, never passed on. */
export const controlOptions = {
  config: {
    flags: "--config <file>",
    group: "Config file",
    config: false,
    schema: z
      .string()
      .min(1)
      .optional()
      .describe("read options from this YAML file (default: .espalier.yaml if present)"),
  },
  withoutConfig: {
    flags: "--without-config",
    group: "Config file",
    config: false,
    schema: z.boolean().default(false).describe("read no config file, not even .espalier.yaml"),
  },
  optionsInEffect: {
    flags: "--options-in-effect",
    group: "Config file",
    config: false,
    schema: z
      .boolean()
      .default(false)
      .describe("print the options this run would use (flags over config file over defaults) and stop"),
  },
  help: {
    flags: "-h, --help",
    group: "Help",
    config: false,
    schema: z.boolean().default(false).describe("print this help and stop"),
  },
  version: {
    flags: "--version",
    group: "Help",
    config: false,
    schema: z.boolean().default(false).describe("print espalier's version and stop"),
  },
} satisfies Record<string, OptionSpec>;

/**
 * Options of printed output, which the interactive view (it has its own screen, with no header and its
 * own order and numbers) does not take.
 */
const printedOnly = new Set([
  "budget",
  "format",
  "output",
  "sqlTable",
  "bare",
  "legend",
  "share",
  "siblingOrder",
]);

/** The options each command takes, by key. */
export const commandOptions: Record<CommandName, Record<string, OptionSpec>> = {
  summary: { ...sharedOptions, ...summaryOnlyOptions, ...controlOptions },
  diff: { ...sharedOptions, ...diffOnlyOptions, ...controlOptions },
  explore: {
    ...Object.fromEntries(Object.entries(sharedOptions).filter(([key]) => !printedOnly.has(key))),
    ...controlOptions,
  },
};

/** Every option, by key. */
export const allOptions: Record<string, OptionSpec> = {
  ...sharedOptions,
  ...summaryOnlyOptions,
  ...diffOnlyOptions,
  ...controlOptions,
};

type Shape<T extends Record<string, OptionSpec>> = { [K in keyof T]: T[K]["schema"] };

function shapeOf<T extends Record<string, OptionSpec>>(table: T): Shape<T> {
  const shape: Record<string, z.ZodType> = {};
  for (const [key, spec] of Object.entries(table)) shape[key] = spec.schema;
  return shape as Shape<T>;
}

/**
 * Which options the run was given (on the command line or in the config file), beside their values: an
 * option set to its default value on purpose (`--size-field size`) is named, and checked as such.
 * Absent when the options were made in code.
 */
export interface NamedOptions {
  named?: ReadonlySet<string>;
}

/** The validated options every command takes. */
export const sharedOptionsSchema = z.object(shapeOf(sharedOptions));
export type SharedCliOptions = z.infer<typeof sharedOptionsSchema> & NamedOptions;

/** The validated options of a summary, as the core receives them. */
export const summaryOptionsSchema = z.object({ ...shapeOf(sharedOptions), ...shapeOf(summaryOnlyOptions) });
export type SummaryCliOptions = z.infer<typeof summaryOptionsSchema> & NamedOptions;

/** The validated options of `espalier diff`: every option of a summary, plus the diff's own. */
export const diffOptionsSchema = z.object({ ...shapeOf(sharedOptions), ...shapeOf(diffOnlyOptions) });
export type DiffCliOptions = z.infer<typeof diffOptionsSchema> & NamedOptions;

/** The options a config file may set (every key optional; unknown keys refused). */
export const configSchema = z
  .object(
    shapeOf(
      Object.fromEntries(
        Object.entries<OptionSpec>({ ...sharedOptions, ...summaryOnlyOptions, ...diffOnlyOptions }).filter(
          ([, spec]) => spec.config !== false,
        ),
      ),
    ),
  )
  .partial()
  .strict()
  .describe("espalier project configuration (.espalier.yaml)");

/** Environment variable holding the secret for --pseudonymize. */
export const PSEUDONYM_KEY_ENV = "ESPALIER_PSEUDONYM_KEY";

/** Budget when printing to something that is not a terminal. */
export const DEFAULT_BUDGET = 40;
