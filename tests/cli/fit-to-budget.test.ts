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
