import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { optionFlags } from "../../src/cli/option-flags.js";
import { allOptions, optionGroups } from "../../src/cli/options.js";

const docs = readFileSync(new URL("../../docs/cli.md", import.meta.url), "utf8");

/** docs/cli.md's sections: heading -> the flags written in the first cell of its table rows. */
function documentedFlags(): Map<string, string[]> {
  const sections = new Map<string, string[]>();
  let heading = "";
  for (const line of docs.split("\n")) {
    const h = /^## (.+)$/.exec(line);
    if (h) {
      heading = h[1];
      sections.set(heading, []);
      continue;
    }
    const cell = /^\| `([^`]+)` \|/.exec(line);
    if (cell?.[1].startsWith("-")) sections.get(heading)?.push(cell[1]);
  }
  return sections;
}

describe("the option declarations (src/cli/options.ts)", () => {
  const sections = documentedFlags();

  it.each(Object.entries(allOptions))(
    "documents %s in docs/cli.md, in the section of its group",
    (key, spec) => {
      expect(sections.get(spec.group), `docs/cli.md has a section "## ${spec.group}"`).toBeDefined();
      expect(sections.get(spec.group)).toContain(spec.flags);
      expect(optionFlags(key, spec).help, "every option has a line of help").not.toBe("");
    },
  );

  it("declares every option docs/cli.md documents, and docs/cli.md lists the groups in the help's order", () => {
    const declared = new Set(Object.values(allOptions).map((spec) => spec.flags));
    for (const [heading, flags] of sections)
      for (const flags1 of flags) expect(declared.has(flags1), `${flags1} under ${heading}`).toBe(true);
    const headings = [...sections.keys()].filter((h) => (optionGroups as readonly string[]).includes(h));
    expect(headings).toEqual([...optionGroups]);
  });

  it.each(Object.entries(allOptions))(
    "says in --help what %s is when not given, and docs/cli.md gives the same default",
    (key, spec) => {
      const flags = optionFlags(key, spec);
      if (flags.switchValue !== undefined) return; // a switch: off, or on by its --no- name
      const declared = Array.isArray(flags.defaultValue) ? undefined : flags.defaultValue;
      // --help adds "when not given: D" for a declared default (help.ts); any other says it itself.
      if (declared === undefined)
        expect(flags.help, `${flags.long}'s help`).toMatch(/default|when not given|none/);
      else {
        const row = docs.split("\n").find((line) => line.startsWith(`| \`${spec.flags}\` |`)) ?? "";
        // A table with a default column, or the meaning naming it: `D` (default).
        expect(
          row.startsWith(`| \`${spec.flags}\` | \`${String(declared)}\` |`) ||
            row.includes(`\`${String(declared)}\` (default`),
          `docs/cli.md's row of ${spec.flags} gives its default ${String(declared)}`,
        ).toBe(true);
      }
    },
  );

  it("gives every option a long name of its own and one-letter names that do not repeat", () => {
    const names = Object.entries(allOptions).flatMap(([key, spec]) => {
      const f = optionFlags(key, spec);
      return f.short ? [f.long, f.short] : [f.long];
    });
    expect(new Set(names).size).toBe(names.length);
  });
});
