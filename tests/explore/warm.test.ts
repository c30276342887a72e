import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { prepareDiff } from "../../src/diff/diff-trees.js";
import { draw } from "../../src/explore/screen.js";
import { diffSession, type Session, summarySession } from "../../src/explore/session.js";
import { type ExploreEvent, startState, update } from "../../src/explore/update.js";
import { warmFits } from "../../src/explore/warm.js";
import { prepare } from "../../src/summarize.js";
import { arbEdited } from "../diff/edit-script.js";
import { arbTree } from "../helpers/random-tree.js";

const look = { units: "bytes" as const, chains: true };
const moves: ExploreEvent[] = [
  { char: "i" },
  { name: "down" },
  { char: "i" },
  { name: "right" },
  { char: "i" },
];

/** Every screen of `moves` from the first state, warmed first or not. */
function screens(make: () => Session, rows: number, cols: number, warm: boolean): string[] {
  const s = make();
  let state = startState(s, { rows, cols, foci: new Int32Array(0), importance: "depth", fociFile: "f" });
  if (warm) warmFits(s, state);
  const out = [draw(s, state, false).rows.join("\n")];
  for (const e of moves) {
    state = update(s, state, e);
    out.push(draw(s, state, false).rows.join("\n"));
  }
  return out;
}

describe("warmFits(session, state)", () => {
  it("changes no screen: the same keys give the same screens, warmed or not (summaries)", () => {
    fc.assert(
      fc.property(
        arbTree(),
        fc.integer({ min: 3, max: 20 }),
        fc.integer({ min: 20, max: 80 }),
        (tree, rows, cols) => {
          const make = () => summarySession(prepare(tree), look);
          expect(screens(make, rows, cols, true)).toEqual(screens(make, rows, cols, false));
        },
      ),
      { numRuns: 40 },
    );
  });

  it("changes no screen of a diff either", () => {
    fc.assert(
      fc.property(arbEdited(30), fc.integer({ min: 4, max: 20 }), ({ oldTree, newTree }, rows) => {
        const make = () => diffSession(prepareDiff(oldTree, newTree), look);
        expect(screens(make, rows, 60, true)).toEqual(screens(make, rows, 60, false));
      }),
      { numRuns: 30 },
    );
  });
});
