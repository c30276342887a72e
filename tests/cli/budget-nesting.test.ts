import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Guarantee 2 of docs/selection.md on the printed screen: raising the budget never hides a node that
// was shown, except where the key takes lines the tree had (it is printed at last, at the budget a
// `key left out` screen names, or takes more rows): the tree's lines then fall, and only then may a
// node go. Field test: the org chart at 32 columns, --budget 13 (key left out, 8 lines for the tree)
// against 14 (a key of 4 rows, 7 lines): Eira Garholm's line went, on 44a9f63; a key in part at 13
// (3 rows, `rest: --legend`) keeps the tree's 7 lines and the two nest.
const ORG = ["fixtures/quillfeather-org.csv", "--parent-field", "manager", "--size-field", "cost"];
const cases = [
  [...ORG, "--focus", "Q2417"],
  [...ORG, "--focus", "Q2417", "--no-chains"],
  ["diff", "fixtures/examples/packages-main.paths", "fixtures/examples/packages-branch.paths"],
];

/** The paths a screen shows (its JSON's nodes), and the lines its text gives the tree; null if refused. */
async function shownAt(args: string[], budget: number, width: number) {
  const env = { COLUMNS: String(width), NO_COLOR: "1" };
  const text = await cli([...args, "--budget", String(budget)], { env });
  const json = await cli([...args, "--budget", String(budget), "--format", "json"], { env });
  if (text.code !== 0 || json.code !== 0) return null;
  const paths = new Set<string>();
  const walk = (n: { path: string; children?: unknown[] }) => {
    paths.add(n.path);
    for (const c of n.children ?? []) walk(c as { path: string; children?: unknown[] });
  };
  walk(JSON.parse(json.stdout).root);
  const lines = text.stdout.trimEnd().split("\n");
  return { paths, tree: lines.length - lines.findIndex((l) => /^[*:.&] /.test(l)) };
}

describe("the printed screen at budget B and B + 1", () => {
  it("shows at B + 1 every node B shows, unless the key took lines from the tree (property)", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...cases),
        fc.integer({ min: 6, max: 40 }),
        fc.constantFrom(30, 32, 34, 40, 48, 60, 80, 120),
        async (args, budget, width) => {
          const [lower, upper] = [await shownAt(args, budget, width), await shownAt(args, budget + 1, width)];
          if (lower === null || upper === null) return;
          // The JSON's selection is the text's: as many nodes as tree lines, or fewer with chains.
          expect(lower.paths.size).toBeGreaterThanOrEqual(lower.tree);
          const lost = [...lower.paths].filter((p) => !upper.paths.has(p));
          if (upper.tree >= lower.tree)
            expect(lost, `${width} columns, ${budget} -> ${budget + 1}`).toEqual([]);
        },
      ),
      { numRuns: 60 },
    );
  });

  it("prints the key in part where the whole would cost the root and the focus paths their place, and nests (the field test)", async () => {
    const args = [...ORG, "--focus", "Q2417"];
    for (let budget = 12; budget < 16; budget++) {
      const [lower, upper] = [await shownAt(args, budget, 32), await shownAt(args, budget + 1, 32)];
      expect(
        [...lower!.paths].filter((p) => !upper!.paths.has(p)),
        `${budget} -> ${budget + 1}`,
      ).toEqual([]);
      expect(upper!.tree).toBeGreaterThanOrEqual(lower!.tree);
    }
    const text = (await cli([...args, "--budget", "13"], { env: { COLUMNS: "32", NO_COLOR: "1" } })).stdout;
    // Every mark said, and where the rest is.
    expect(text).toMatch(/^key: '\*' focus, ':' on path$/m);
    expect(text).toMatch(/ rest: --legend$/m);
  });
});
