import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// A chain of 12 nodes with a side branch at each level, and a focus at its end: the header wraps at
// narrow widths (the focus path is long), so how many lines it takes depends on the budget it states.
const rows = ["id,parent,name"];
for (let k = 1; k <= 12; k++) {
  rows.push(`${k},${k === 1 ? "" : k - 1},level-${k}-of-the-tidewater-chain`);
  rows.push(`s${k},${k},side-${k}`);
}
const stdin = `${rows.join("\n")}\n`;
const focus = Array.from({ length: 12 }, (_, k) => `level-${k + 1}-of-the-tidewater-chain`).join("/");

async function at(budget: number, width: number, more: string[] = []) {
  const args = ["-", "--input-format", "csv", "--focus", focus, "--no-chains", "--budget", String(budget)];
  return cli([...args, "--width", String(width), ...more], { stdin });
}

describe("fitToBudget(fit, budget) through the command line", () => {
  it("names a smallest budget that works, and one less does not (field test: it named 15 where 17 was needed)", async () => {
    for (const width of [32, 60, 100])
      for (const more of [[], ["--format", "json"]]) {
        const refused = await at(8, width, more);
        expect(refused.stderr).toContain("[BUDGET_TOO_SMALL]");
        const smallest = Number(/smallest budget that works is (\d+)/.exec(refused.stderr)![1]);
        const works = await at(smallest, width, more);
        expect(works.code, `${width}: ${smallest}: ${works.stderr}`).toBe(0);
        const below = await at(smallest - 1, width, more);
        expect(below.stderr, `${width}: ${smallest - 1}`).toContain("[BUDGET_TOO_SMALL]");
      }
  });

  it("prints no more lines than the budget, and says so on the header, at every budget that works", async () => {
    for (const width of [32, 60, 100])
      for (let budget = 14; budget <= 24; budget++) {
        const r = await at(budget, width);
        if (r.code !== 0) continue;
        const lines = r.stdout.trimEnd().split("\n");
        expect(lines.length, `${width}/${budget}`).toBeLessThanOrEqual(budget);
        expect(r.stdout).toContain(`${lines.length} of ${budget} lines`);
        // Either the key is printed, or the header says where it is (a budget with room for neither is refused).
        const keyed = lines.some((l) => l.startsWith("key: "));
        const said = /key left out: --budget (\d+) has room|no key: --budget (\d+)/.exec(
          r.stdout.replaceAll("\n  ", " "),
        );
        expect(keyed || said !== null, `${width}/${budget}:\n${r.stdout}`).toBe(true);
        if (said) {
          const room = await at(Number(said[1] ?? said[2]), width);
          expect(
            room.stdout.split("\n").some((l) => l.startsWith("key: ")),
            `${width}/${said[1] ?? said[2]}`,
          ).toBe(true);
        }
      }
  });

  it("refuses a budget with room for the root and the focus paths but neither for the key nor for saying it was left out", async () => {
    // At 32 columns the header wraps: 14 lines hold it, the 12 focus-path lines and nothing more.
    // (Before, such a screen printed no key and no word of one: its marks unexplained.)
    const refused = await at(14, 32);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toContain("[BUDGET_TOO_SMALL]");
    expect(refused.stderr).toContain("the key or a note that it was left out");
    const smallest = Number(/smallest budget that works is (\d+)/.exec(refused.stderr)![1]);
    const works = await at(smallest, 32);
    expect(works.code).toBe(0);
    expect(works.stdout.replaceAll("\n  ", " ")).toMatch(
      /^key: |key left out: --budget \d+ has room|no key: --budget/m,
    );
  });
});

describe("espalier diff: BUDGET_TOO_SMALL's numbers", () => {
  it("names lines before the tree that the smallest budget it names can hold with the root (field test: 10 lines and 10)", async () => {
    // Field test: `espalier diff b1.json b2.json --budget 8 --width 40` said `cannot hold the 10
    // lines before the tree and the root; the smallest budget that works is 10`: the 10 counted a
    // key the budget of 10 leaves out (its header says so). An invented file listing, two versions:
    // some files gone, some new, some grown.
    const listing = (keep: (i: number) => boolean, grow: number) =>
      Array.from({ length: 300 }, (_, i) => i)
        .filter(keep)
        .map(
          (i) =>
            `${1000 + i * 37 + (i % 5 === 0 ? grow : 0)}\ttidewater/svc-${i % 7}/mod-${i % 13}/file-${i}.dat`,
        )
        .join("\n");
    const files = {
      "old.tsv": listing((i) => i % 11 !== 0, 0),
      "new.tsv": listing((i) => i % 13 !== 0, 123456),
    };
    let refused = 0;
    for (let budget = 4; budget <= 12; budget++) {
      const r = await cli(["diff", "old.tsv", "new.tsv", "--budget", `${budget}`, "--width", "40"], {
        files,
      });
      if (r.code === 0) continue;
      refused++;
      const said =
        /cannot hold the (\d+) lines before the tree(, the root and the key or a note)?.*smallest budget that works is (\d+)/.exec(
          r.stderr,
        );
      expect(said, r.stderr).not.toBeNull();
      const [, before, note, smallest] = said!;
      // The lines named, the root and the note's line where named: no more than the smallest budget.
      expect(Number(before) + 1 + (note ? 1 : 0), r.stderr).toBeLessThanOrEqual(Number(smallest));
      const ok = await cli(["diff", "old.tsv", "new.tsv", "--budget", smallest, "--width", "40"], { files });
      expect(ok.code).toBe(0);
    }
    expect(refused).toBeGreaterThan(1);
  });
});
