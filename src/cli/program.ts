import { Command, Option } from "commander";
import { EspalierError } from "../errors.js";
import { importances } from "../interest/importance.js";
import { addDiffCommand } from "./diff-command.js";
import { effectiveOptions, printConfig, requireInput } from "./effective-options.js";
import { addExploreCommand } from "./explore-command.js";
import { printSqlCommand } from "./fact-input.js";
import { SUMMARY_EXAMPLES } from "./help.js";
import type { CliIO } from "./io.js";
import { cliInputFormats, outputFormats, summaryOptionsSchema } from "./options.js";
import { summaryCommand } from "./summary-command.js";

export const VERSION = "0.1.0";

const collect = (value: string, previous: string[]) => [...previous, value];

/**
 * The command-line interface. Actions return their output as text; `onOutput` receives it so that
 * nothing is written before the whole result exists (no partial output on error).
 */
export function buildProgram(io: CliIO, onOutput: (text: string, exitCode?: number) => void): Command {
  const program = new Command("espalier")
    .description(
      "Show the part of a large hierarchy that matters, plus enough context, within a line budget. " +
        "Reads nested JSON or YAML, CSV/TSV tables linked by id and parent (or a path column), JSON rows " +
        "and path lists, and scores every node by its degree of interest (Furnas) against the foci.",
    )
    .version(VERSION, "-V, --version")
    .argument("[input]", "file to read, or - for standard input")
    .option("-f, --focus <path>", "focus path, row id or glob; repeatable", collect, [])
    .option("--focus-from <file>", "read more foci from a file, one per line (- for standard input)")
    .option("-b, --budget <lines>", "line budget (default: terminal height, else 40)")
    .addOption(new Option("--format <format>", "output format").choices(outputFormats).default("text"))
    .addOption(
      new Option("--input-format <format>", "input format (default: detected)").choices(cliInputFormats),
    )
    .option("--levels <columns>", "fact table: level columns, outermost first (account,service,region)")
    .option("--key-field <column>", "fact table: a key column split into levels")
    .option("--key-separator <text>", "what --key-field values are split on", "/")
    .option("--key-depth <levels>", "deepest key level to roll up (default: the deepest in the table)")
    .option("--rolled-up", "the input is the result table of the --print-sql query, run elsewhere")
    .option("--print-sql", "print the rollup query in standard SQL (GROUP BY ROLLUP) and stop")
    .option("--sql-table <name>", "table name in the --print-sql query", "facts")
    .option("--name-field <field>", "field holding a node's name", "name")
    .option("--children-field <field>", "field holding a node's children", "children")
    .option("--size-field <field>", "field holding a node's own size", "size")
    .option("--id-field <column>", "column holding a row's id", "id")
    .option("--parent-field <column>", "column holding the parent's id", "parent")
    .option("--path-field <column>", "column holding a row's path", "path")
    .addOption(
      new Option("--importance <kind>", "a-priori importance: depth, or size (bigger subtrees matter more)")
        .choices(importances)
        .default("depth"),
    )
    .addOption(
      new Option(
        "--units <units>",
        "sizes as bytes (KiB, MiB) or plain numbers; auto: bytes when the size field is size",
      )
        .choices(["auto", "bytes", "plain"])
        .default("auto"),
    )
    .option("--label <template>", "label template from record fields, e.g. '{title}, {team}'")
    .option("--pseudonymize", "print keyed pseudonyms instead of names (secret in ESPALIER_PSEUDONYM_KEY)")
    .addOption(
      new Option("--color <when>", "colour in text output")
        .choices(["auto", "always", "never"])
        .default("auto"),
    )
    .option("--max-nodes <count>", "refuse inputs with more nodes than this")
    .option("-o, --output <file>", "write to this file, whole or not at all, instead of standard output")
    .option("--width <columns>", "widest text line, in terminal columns (default: terminal width)")
    .option("--no-chains", "give every node its own line (by default a run of only children shares one)")
    .option("--config <file>", "read options from this YAML file (default: .espalier.yaml if present)")
    .option("--no-config", "ignore any config file")
    .option(
      "--print-config",
      "print the effective configuration (flags over config file over defaults) and stop",
    )
    .addHelpText("after", SUMMARY_EXAMPLES)
    .showHelpAfterError("(run espalier --help for usage and examples)")
    .exitOverride()
    .configureOutput({ writeOut: (s) => io.stdout.write(s), writeErr: (s) => io.stderr.write(s) })
    .action(async (input: string | undefined, raw: Record<string, unknown>, command: Command) => {
      const { values, configFile } = await effectiveOptions(command, raw, io);
      const parsed = summaryOptionsSchema.safeParse({
        ...values,
        pseudonymize: values.pseudonymize === true,
        rolledUp: values.rolledUp === true,
        printSql: values.printSql === true,
        chains: values.chains !== false,
      });
      if (!parsed.success) {
        const issue = parsed.error.issues[0];
        throw new EspalierError("USAGE", issue.message);
      }
      if (raw.printConfig === true) return onOutput(printConfig(parsed.data, configFile));
      if (parsed.data.printSql) return onOutput(await printSqlCommand(input, parsed.data));
      onOutput(await summaryCommand(requireInput(input), parsed.data, io));
    });
  addDiffCommand(program, io, onOutput);
  addExploreCommand(program, io, onOutput);
  return program;
}
