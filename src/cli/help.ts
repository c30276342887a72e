import { displayWidth } from "../render/display-width.js";
import type { CommandSpec } from "./commands.js";
import type { OptionFlags } from "./option-flags.js";
import { allOptions, type CommandName, optionGroups } from "./options.js";
import { flagsByKey } from "./parse-command-line.js";

const INDENT = "  ";
const GAP = 2;
/** Help lines are wrapped to this many columns. */
const WIDTH = 100;

/**
 * `espalier --help` / `espalier diff --help`: what espalier does, how to call each command, every
 * option in docs/cli.md's groups (with choices and defaults, all from the option declarations), the
 * command's worked examples and its exit statuses. Returns the text; the caller prints it.
 */
export function renderHelp(command: CommandName, commands: Record<CommandName, CommandSpec>): string {
  const spec = commands[command];
  const out: string[] = [...wrap(`espalier: ${spec.about}`, WIDTH), ""];
  const usages = (Object.keys(commands) as CommandName[]).map((c) => [
    commands[c].usage,
    commands[c].summary,
  ]);
  out.push(...columns(usages, widest(usages)), "");
  out.push(
    ...wrap(
      "<input>, <old> and <new> are files, or - for standard input (at most one of them). Options may " +
        "come anywhere, before or after the command's name; an option of one command only is refused " +
        "by the other.",
      WIDTH,
    ),
    "",
  );
  // Every group in docs/cli.md's order, so one help lists every option once.
  const groups = optionGroups.map((group) => ({
    group,
    rows: [...flagsByKey.values()]
      .filter((flags) => allOptions[flags.key].group === group)
      .map((flags) => [flagText(flags), describe(flags)]),
  }));
  const left = Math.max(...groups.map(({ rows }) => widest(rows)));
  for (const { group, rows } of groups) {
    if (rows.length > 0) out.push(group, ...columns(rows, left), "");
  }
  out.push(spec.examples.trim(), "");
  out.push(spec.exitStatus.trim(), "");
  return `${out.join("\n").trimEnd()}\n`;
}

function flagText(flags: OptionFlags): string {
  const long = flags.valueName === undefined ? flags.long : `${flags.long} <${flags.valueName}>`;
  return flags.short === undefined ? `    ${long}` : `${flags.short}, ${long}`;
}

function describe(flags: OptionFlags): string {
  let text = flags.help;
  if (flags.choices) text += `; one of ${flags.choices.join(", ")}`;
  const noDefault =
    flags.defaultValue === undefined ||
    flags.switchValue !== undefined ||
    (Array.isArray(flags.defaultValue) && flags.defaultValue.length === 0);
  if (!noDefault) text += `; default ${String(flags.defaultValue)}`;
  return text;
}

function widest(rows: string[][]): number {
  return Math.max(0, ...rows.map(([cell]) => displayWidth(cell)));
}

/** Rows of two cells, the second starting after `left` columns and a gap, wrapped under itself. */
function columns(rows: string[][], left: number): string[] {
  const hang = " ".repeat(INDENT.length + left + GAP);
  return rows.flatMap(([cell, text]) => {
    const [first, ...rest] = wrap(text, WIDTH - hang.length);
    const pad = " ".repeat(left - displayWidth(cell) + GAP);
    return [`${INDENT}${cell}${pad}${first}`, ...rest.map((line) => hang + line)];
  });
}

/** The words of `text` in lines of at most `width` columns (a longer word stands alone). */
function wrap(text: string, width: number): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    if (line !== "" && displayWidth(line) + 1 + displayWidth(word) > width) {
      lines.push(line);
      line = word;
    } else line = line === "" ? word : `${line} ${word}`;
  }
  lines.push(line);
  return lines;
}
