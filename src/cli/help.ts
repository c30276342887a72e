import { displayWidth } from "../render/display-width.js";
import { legendLines } from "../render/marks.js";
import { wrapWords as wrap } from "../render/wrap-words.js";
import type { CommandSpec } from "./commands.js";
import type { OptionFlags } from "./option-flags.js";
import { type CommandName, commandNames, commandOptions, type OptionGroup, optionGroups } from "./options.js";
import { flagsByKey } from "./parse-command-line.js";
import { packageVersion } from "./version.js";

/** Help lines are wrapped to this many columns. */
const WIDTH = 100;
/** Where an option's text starts, and a longer option name's text on the line below. */
const TEXT_AT = 26;
/** Indent of the entries under a heading. */
const INDENT = "  ";

/** What each group of options is for, after its name (the names are docs/cli.md's sections). */
const GROUP_PURPOSE: Record<OptionGroup, string> = {
  Focus: "where to look",
  "Budget and layout": "how much to show, and how",
  Output: "what to print, and where",
  Input: "how the input is read",
  "Fact tables": "tables of facts, rolled up by their columns",
  "Diff only": "espalier diff",
  "Config file": "options kept in a file",
  Help: "about espalier itself",
};

const ABOUT =
  "shows the part of a large hierarchy that matters, with enough context, within a line budget. It " +
  "reads nested JSON or YAML, CSV/TSV tables linked by id and parent (or by a path column), JSON rows " +
  "and path lists; scores every node by its degree of interest (Furnas) against the foci; and folds " +
  "the rest into lines whose counts and sizes add up.";

/**
 * `espalier --help`, `espalier diff --help`, `espalier explore --help`: what espalier does, how each
 * command is called, the options the command takes in docs/cli.md's groups (choices and defaults from
 * their declarations), how to read the output, worked examples on the demo data (a test runs each),
 * and the exit statuses. Returns the text; the caller prints it.
 */
export function renderHelp(command: CommandName, commands: Record<CommandName, CommandSpec>): string {
  const spec = commands[command];
  const out: string[] = [...wrap(`espalier ${packageVersion()} ${ABOUT}`, WIDTH), ""];

  out.push("Commands");
  const usageWidth = Math.max(...commandNames.map((c) => displayWidth(commands[c].usage)));
  for (const c of commandNames) out.push(...entry(commands[c].usage, commands[c].summary, usageWidth + 4));
  out.push(
    ...wrap(
      "INPUT, OLD and NEW are files, or - for standard input (one of them at most). Options go anywhere " +
        "on the line, before or after the command's name.",
      WIDTH,
    ),
    "",
  );

  const takes = commandOptions[command];
  for (const group of optionGroups) {
    const options = [...flagsByKey.values()].filter(
      (flags) => flags.key in takes && takes[flags.key].group === group,
    );
    if (options.length === 0) continue;
    out.push(`${group}: ${GROUP_PURPOSE[group]}`);
    for (const flags of options) out.push(...entry(optionName(flags), optionText(flags), TEXT_AT));
    out.push("");
  }
  if (command === "summary")
    out.push(
      ...wrap("espalier diff --help and espalier explore --help list those commands' options.", WIDTH),
      "",
    );

  out.push(`Reading ${command === "diff" ? "a diff" : "the output"}`);
  // The same lines as --legend prints under the header (one source, src/render/marks.ts).
  for (const line of legendLines(command === "diff" ? "diff" : "summary"))
    out.push(...wrap(line, WIDTH - INDENT.length).map((l) => INDENT + l));
  out.push("", ...wrap(spec.notes, WIDTH), "");

  out.push("On the demo data (from the project's folder)");
  for (const example of spec.examples) out.push(`${INDENT}${example.what}:`, `${INDENT}  $ ${example.line}`);
  out.push("");

  out.push("Exit status");
  for (const [status, meaning] of spec.exitStatus) out.push(...entry(String(status), meaning, 8));
  return `${out.join("\n")}\n`;
}

/** `--focus PATH (-f)`: the long name first, the value in capitals, a one-letter name after it. */
function optionName(flags: OptionFlags): string {
  const value = flags.valueName === undefined ? "" : ` ${flags.valueName.toUpperCase()}`;
  return `${flags.long}${value}${flags.short === undefined ? "" : ` (${flags.short})`}`;
}

/** The option's one line of help, then its choices and what it is when not given. */
function optionText(flags: OptionFlags): string {
  let text = flags.help;
  const { defaultValue, choices } = flags;
  const hasDefault =
    defaultValue !== undefined &&
    flags.switchValue === undefined &&
    !(Array.isArray(defaultValue) && defaultValue.length === 0);
  if (choices) {
    text += `. Takes ${choices.slice(0, -1).join(", ")} or ${choices[choices.length - 1]}`;
    if (hasDefault) text += `; when not given: ${String(defaultValue)}`;
  } else if (hasDefault) text += `. When not given: ${String(defaultValue)}`;
  return text;
}

/** `name` then `text` from column `at` (or on the next line when `name` reaches it), wrapped under itself. */
function entry(name: string, text: string, at: number): string[] {
  const hang = " ".repeat(INDENT.length + at);
  const lines = wrap(text, WIDTH - hang.length).map((line) => hang + line);
  const head = INDENT + name;
  if (displayWidth(head) + 2 <= hang.length) lines[0] = head + lines[0].slice(displayWidth(head));
  else lines.unshift(head);
  return lines;
}

/** The words of `text` in lines of at most `width` columns (a longer word stands alone). */
