import { unmatchedFociChoices } from "../focus/focus-spec.js";
import { importances } from "../interest/importance.js";
import { inputFormats } from "../load/load-options.js";
import { siblingOrders } from "../view/sibling-order.js";
import { type OptionGroup, type OptionSpec, type OptionsOf, optionGroups } from "./option-spec.js";
import { choice, count, flag, list, text } from "./option-value.js";
import { validateOptions } from "./validate-options.js";

export { type OptionGroup, type OptionSpec, type OptionsOf, optionGroups };

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
 * Options of every command (summary and diff). To add an option: add one entry here (or in
 * {@link summaryOnlyOptions} / {@link diffOnlyOptions}) and one row in docs/cli.md's section for its
 * group; the parser, `--help`, the config schema and the validated options follow.
 */
export const sharedOptions = {
  focus: {
    flags: "-f, --focus <path>",
    group: "Focus",
    value: list(),
    help: "a node to show with its context: path, row id or glob; repeatable (none: the tree from its root)",
  },
  focusFrom: {
    flags: "--focus-from <file>",
    group: "Focus",
    config: false,
    value: text(),
    help: "more foci from a file, one per line (- for standard input; none when not given)",
  },
  unmatchedFoci: {
    flags: "--unmatched-foci <choice>",
    group: "Focus",
    value: choice(unmatchedFociChoices, "error"),
    help: "a focus that matches no node: error, or skip it (listed on standard error and in JSON)",
  },
  budget: {
    flags: "-b, --budget <lines>",
    group: "Budget and layout",
    value: count(),
    help: "most lines to print (default: the terminal's height less one, else 40)",
  },
  width: {
    flags: "--width <columns>",
    group: "Budget and layout",
    value: count(),
    help: "widest line in terminal columns, 30 or more (default: COLUMNS, else the terminal's width, else no limit)",
  },
  chains: {
    flags: "--no-chains",
    group: "Budget and layout",
    value: flag(true),
    help: "a run of only children shares one line; --no-chains gives every node its own",
  },
  importance: {
    flags: "--importance <kind>",
    group: "Budget and layout",
    value: choice(importances, "depth"),
    help: "a-priori importance: depth, or size (bigger subtrees matter more)",
  },
  format: {
    flags: "--format <format>",
    group: "Output",
    value: choice(outputFormats, "text"),
    help: "what to print",
  },
  output: {
    flags: "-o, --output <file>",
    group: "Output",
    config: false,
    value: text({ nonEmpty: true }),
    help: "write to this file, whole or not at all (default: standard output)",
  },
  units: {
    flags: "--units <units>",
    group: "Output",
    value: choice(unitModes, "auto"),
    help: "sizes as bytes (KiB, MiB) or plain numbers; auto: bytes for file sizes and a document's bytes",
  },
  label: {
    flags: "--label <template>",
    group: "Output",
    value: text(),
    help: "the text of each node from record fields, e.g. '{title}, {team}' (default: its name)",
  },
  pseudonymize: {
    flags: "--pseudonymize",
    group: "Output",
    value: flag(false),
    help: "print keyed pseudonyms instead of names and ids (secret in ESPALIER_PSEUDONYM_KEY)",
  },
  bare: {
    flags: "--bare",
    group: "Budget and layout",
    value: flag(false),
    help: "print no header or key line, only the tree's lines (for scripts)",
  },
  legend: {
    flags: "--legend",
    group: "Budget and layout",
    value: flag(false),
    help: "print what the marks and numbers mean under the header (the budget counts it)",
  },
  key: {
    flags: "--no-key",
    group: "Budget and layout",
    value: flag(true),
    help: "print no key line under the header (one line on what the marks and numbers on screen mean, printed when the budget has 6 lines or more; the budget counts it)",
  },
  share: {
    flags: "--share <of>",
    group: "Output",
    value: choice(shareChoices, "none"),
    help: "add each node's share in percent: of the total, or of the line above",
  },
  siblingOrder: {
    flags: "--sibling-order <order>",
    group: "Output",
    value: choice(siblingOrders, "input"),
    help: "order of shown siblings: input, size (biggest first) or name",
  },
  color: {
    flags: "--color <when>",
    group: "Output",
    value: choice(colorModes, "auto"),
    help: "colour in text output",
  },
  inputFormat: {
    flags: "--input-format <format>",
    group: "Input",
    value: choice(cliInputFormats),
    help: "input format (default: detected)",
  },
  nameField: {
    flags: "--name-field <field>",
    group: "Input",
    value: text({ nonEmpty: true, default: "name" }),
    help: "field holding a node's name",
  },
  childrenField: {
    flags: "--children-field <field>",
    group: "Input",
    value: text({ nonEmpty: true, default: "children" }),
    help: "field holding a node's children",
  },
  readAs: {
    flags: "--read-as <reading>",
    group: "Input",
    value: choice(["auto", "nodes", "values"], "auto"),
    help: "JSON/YAML: node objects, or every value a node sized in bytes; auto: by the document",
  },
  startAt: {
    flags: "--start-at <pointer>",
    group: "Input",
    value: text(),
    help: "JSON/YAML: read only the value at this JSON Pointer (RFC 6901), as /data/items for rows or nodes inside a wrapper object; the rest is checked, not read (default: the whole document)",
  },
  shortRows: {
    flags: "--short-rows <choice>",
    group: "Input",
    value: choice(["error", "fill"], "error"),
    help: "CSV/TSV: a row with fewer fields than the header is an error, or (fill) its missing last fields read as empty",
  },
  nulSeparated: {
    flags: "--nul-separated",
    group: "Input",
    value: flag(false),
    help: "path lists: entries end with a NUL byte (find -print0, git ls-files -z)",
  },
  folderSizes: {
    flags: "--folder-sizes <kind>",
    group: "Input",
    value: choice(["auto", "own", "total"], "auto"),
    help: "path lists: a folder's size is its own (find -printf '%s') or a total with its contents (du -ab); auto: total when each folder comes after its contents and covers them",
  },
  sizeField: {
    flags: "--size-field <field>",
    group: "Input",
    value: text({ nonEmpty: true, default: "size" }),
    help: "field holding a node's own size",
  },
  idField: {
    flags: "--id-field <column>",
    group: "Input",
    value: text({ nonEmpty: true, default: "id" }),
    help: "column holding a row's id",
  },
  parentField: {
    flags: "--parent-field <column>",
    group: "Input",
    value: text({ nonEmpty: true, default: "parent" }),
    help: "column holding the parent row's id",
  },
  nullParent: {
    flags: "--null-parent <value>",
    group: "Input",
    value: list({ nonEmpty: true }),
    help: "a parent cell that means no parent, as an empty one does (0 in a process table, \\N or NULL in a database export); repeatable (default: only an empty cell)",
  },
  pathField: {
    flags: "--path-field <column>",
    group: "Input",
    value: text({ nonEmpty: true, default: "path" }),
    help: "column holding a row's full path",
  },
  childField: {
    flags: "--child-field <column>",
    group: "Input",
    value: text({ nonEmpty: true, default: "child" }),
    help: "column holding an edge's child id (edge tables)",
  },
  graph: {
    flags: "--graph",
    group: "Input",
    value: flag(false),
    help: "read the input as a graph: ids may repeat with other parents; a JSON/YAML object maps ids, a list of records may name each one's child ids",
  },
  nodes: {
    flags: "--nodes <file>",
    group: "Input",
    config: false,
    value: list({
      nonEmpty: true,
      max: { count: 2, message: "is given at most twice: once for both versions, or OLD's then NEW's" },
    }),
    help: "node records of a graph by id (names, sizes, fields) from this CSV/TSV/JSON table; comparing two versions: once for both, or twice (OLD's, then NEW's); none when not given",
  },
  maxNodes: {
    flags: "--max-nodes <count>",
    group: "Input",
    value: count(),
    help: "refuse inputs with more nodes than this (default: no limit)",
  },
  levels: {
    flags: "--levels <columns>",
    group: "Fact tables",
    value: text({ nonEmpty: true }),
    help: "level columns, outermost first, comma-separated (account,service,region); given, the input is a fact table (default: none)",
  },
  keyField: {
    flags: "--key-field <column>",
    group: "Fact tables",
    value: text({ nonEmpty: true }),
    help: "a key column split into levels; given, the input is a fact table (default: none)",
  },
  keySeparator: {
    flags: "--key-separator <text>",
    group: "Fact tables",
    value: text({ nonEmpty: true, default: "/" }),
    help: "what --key-field values are split on",
  },
  keyDepth: {
    flags: "--key-depth <levels>",
    group: "Fact tables",
    value: count(),
    help: "deepest key level to roll up (default: the deepest in the table)",
  },
  sqlTable: {
    flags: "--sql-table <name>",
    group: "Fact tables",
    value: text({ nonEmpty: true, default: "facts" }),
    help: "table name in the --print-sql query",
  },
  pushdown: {
    flags: "--pushdown <when>",
    group: "Fact tables",
    value: choice(pushdownModes, "auto"),
    help: "fetch a big rollup only as deep as the summary reaches (auto: past 1,000,000 rows)",
  },
  rolledUp: {
    flags: "--rolled-up",
    group: "Fact tables",
    value: flag(false),
    help: "the input is the result table of the --print-sql query, run elsewhere",
  },
} satisfies Record<string, OptionSpec>;

/** Options of a summary only. */
export const summaryOnlyOptions = {
  printSql: {
    flags: "--print-sql",
    group: "Fact tables",
    config: false,
    value: flag(false),
    help: "print the rollup plan the engine runs as one standard SQL query, and stop",
  },
  sqlReach: {
    flags: "--sql-reach <levels>",
    group: "Fact tables",
    value: count(),
    help: "with --print-sql and foci: a pushdown query, only nodes this near the focus paths (default: the whole rollup)",
  },
} satisfies Record<string, OptionSpec>;

/** Options of `espalier diff` only. */
export const diffOnlyOptions = {
  failOnChange: {
    flags: "--fail-on-change",
    group: "Diff only",
    value: flag(false),
    help: "exit with status 1 when the versions differ (0 when they are the same, 2 on an error)",
  },
  compareField: {
    flags: "--compare-field <field>",
    group: "Diff only",
    value: list({ nonEmpty: true }),
    help: "a record field compared between matched nodes; a new value is a change (edited); repeatable (default: version, then every other field the records hold)",
  },
} satisfies Record<string, OptionSpec>;

/** Options that steer the run itself (config file, help): never in a config file, never passed on. */
export const controlOptions = {
  config: {
    flags: "--config <file>",
    group: "Config file",
    config: false,
    value: text({ nonEmpty: true }),
    help: "read options from this YAML file (default: .espalier.yaml if present)",
  },
  withoutConfig: {
    flags: "--without-config",
    group: "Config file",
    config: false,
    value: flag(false),
    help: "read no config file, not even .espalier.yaml",
  },
  optionsInEffect: {
    flags: "--options-in-effect",
    group: "Config file",
    config: false,
    value: flag(false),
    help: "print the options this run would use (flags over config file over defaults) and stop",
  },
  help: {
    flags: "-h, --help",
    group: "Help",
    config: false,
    value: flag(false),
    help: "print this help and stop",
  },
  version: {
    flags: "--version",
    group: "Help",
    config: false,
    value: flag(false),
    help: "print espalier's version and stop",
  },
} satisfies Record<string, OptionSpec>;

/**
 * Options of printed output, which the interactive view (it has its own screen, with no header and its
 * own order and numbers) does not take.
 */
export const printedOnly: ReadonlySet<string> = new Set([
  "budget",
  "format",
  "output",
  "sqlTable",
  "bare",
  "legend",
  "key",
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

/**
 * Which options the run was given (on the command line or in the config file), beside their values: an
 * option set to its default value on purpose (`--size-field size`) is named, and checked as such.
 * Absent when the options were made in code.
 */
export interface NamedOptions {
  named?: ReadonlySet<string>;
}

/** A command's options: the table its values are checked against (validate-options.ts). */
export interface OptionsSchema<T extends Record<string, OptionSpec> = Record<string, OptionSpec>> {
  table: T;
  /** The values to run with, defaults filled in; a bad value is a USAGE error naming its key. */
  parse(values: Record<string, unknown>): OptionsOf<T>;
}

function optionsSchema<T extends Record<string, OptionSpec>>(table: T): OptionsSchema<T> {
  return { table, parse: (values) => validateOptions(table, values, (key) => ({ name: key })) };
}

/** The options every command takes. */
export const sharedOptionsSchema = optionsSchema(sharedOptions);
export type SharedCliOptions = OptionsOf<typeof sharedOptions> & NamedOptions;

/** The options of a summary, as the core receives them. */
export const summaryOptionsSchema = optionsSchema({ ...sharedOptions, ...summaryOnlyOptions });
export type SummaryCliOptions = OptionsOf<typeof sharedOptions & typeof summaryOnlyOptions> & NamedOptions;

/** The options of `espalier diff`: every option of a summary, plus the diff's own. */
export const diffOptionsSchema = optionsSchema({ ...sharedOptions, ...diffOnlyOptions });
export type DiffCliOptions = OptionsOf<typeof sharedOptions & typeof diffOnlyOptions> & NamedOptions;

/** The options a config file may set: every option but those naming this run's own files. */
export const configOptions: Record<string, OptionSpec> = Object.fromEntries(
  Object.entries<OptionSpec>({ ...sharedOptions, ...summaryOnlyOptions, ...diffOnlyOptions }).filter(
    ([, spec]) => spec.config !== false,
  ),
);

/** Environment variable holding the secret for --pseudonymize. */
export const PSEUDONYM_KEY_ENV = "ESPALIER_PSEUDONYM_KEY";

/** Budget when printing to something that is not a terminal. */
export const DEFAULT_BUDGET = 40;
