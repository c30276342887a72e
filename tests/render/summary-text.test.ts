import { describe, expect, it } from "vitest";
import { buildTree } from "../../src/model/build-tree.js";
import { measure } from "../../src/model/measure.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { cli } from "../helpers/cli.js";
import { makeTree } from "../helpers/make-tree.js";
import { generatedTree, summaryOf } from "../helpers/summary.js";

describe("renderText(view, options)", () => {
  const tree = makeTree("R{A:10{A1:5{A1a:1,A1b:2},A2:3{A2a:4}},B:100{B1:6{B1a:7},B2:8}}");

  it("prints one line per shown node, marks the focus and its ancestors, and folds the rest onto the parent's line", () => {
    const { text } = summaryOf(tree, ["A/A1"], 5);
    expect(text).toBe(
      [
        ": R  11 nodes, 146 B  (hidden: 1 child, 4 nodes, 121 B)",
        "  : A  6 nodes, 25 B  (hidden: 1 child, 2 nodes, 7 B)",
        "    * A1  3 nodes, 8 B",
        "      . A1a  1 B",
        "      . A1b  2 B",
        "",
      ].join("\n"),
    );
  });

  it("prints a root named / as a name of its own in a chain (/ / usr / bin)", () => {
    // An absolute path listing has one root named "/" (docs/input.md); the key's "a / b: b is a's only
    // child" reads "/ / usr" as "/" and its only child "usr".
    const result = summarize(prepare(makeTree("/{usr{bin{a,b}}}")), {
      foci: [],
      budget: 10,
      importance: "depth",
      chains: true,
    });
    const text = renderText(result.view, { units: "plain", sizes: false, chains: true });
    // The numbers are the root's: three names on the line, and a and b below (5). The root "/" is a
    // name of its own, so the sum can be checked by the names shown (glued, "/usr" read as one name
    // left it one short).
    expect(text).toBe([". / / usr / bin  5 nodes", "  . a", "  . b", ""].join("\n"));
    // A node named "/" below the root is an ordinary name too.
    const below = summarize(prepare(makeTree("R{x,/{usr{y,z}}}")), {
      foci: [],
      budget: 10,
      importance: "depth",
      chains: true,
    });
    expect(renderText(below.view, { units: "plain", sizes: false, chains: true })).toContain(
      "  . / / usr  4 nodes",
    );
  });

  it("keeps a root named / apart from a child whose own name starts with / (a mount table's targets)", async () => {
    // Field note: '. //srv/quill  2 nodes' read as one name; the chain's " / " keeps them two, and the
    // printed chain reads back as a focus.
    const mounts = '[{"target":"/","children":[{"target":"/srv/quill","children":[{"target":"x"}]}]}]';
    const args = ["-", "--name-field", "target", "--bare"];
    expect((await cli(args, { stdin: mounts })).stdout).toBe(". / / /srv/quill / x  3 nodes\n");
    const focused = await cli([...args, "--focus", "/ / /srv/quill"], { stdin: mounts });
    expect(focused.stdout).toBe("* / / /srv/quill  3 nodes\n  . x\n");
  });

  it("gives every node a line when the budget holds the whole tree", () => {
    const { text } = summaryOf(tree, ["A/A1"], 100);
    expect(text.split("\n").length - 1).toBe(tree.length);
    expect(text).not.toContain("hidden");
  });

  it("never starts a line with a name, so a name cannot pose as a CI command (lines start with indent and a mark)", () => {
    const t = makeTree("::warning{##vso[task.setvariable]}");
    const { text } = summaryOf(t, [], 10);
    for (const line of text.trimEnd().split("\n")) expect(line).toMatch(/^ *[*:.] /);
  });

  it("spends no line on chrome: a 20,000-node tree with two deep foci shows as many nodes as it has lines", () => {
    // The budget must buy nodes: with two foci about ten levels deep and 40 lines, every line names a node.
    const { parentOf, name, size } = generatedTree(20000);
    const t = buildTree({
      parentOf,
      name,
      ownSize: size,
      hasSizes: true,
      ids: null,
      origin: new Int32Array(parentOf.length),
      originIsRow: false,
      fields: new Map(),
      rootName: "(root)",
    });
    const { count } = measure(t);
    const deep = [...t.depth.keys()].filter((i) => t.depth[i] >= 9 && t.depth[i] <= 11);
    expect(deep.length).toBeGreaterThan(2);
    // Two foci in different top-level subtrees where possible.
    const a = deep[0];
    const b = deep.find((i) => i >= a + count[a]) ?? deep[deep.length - 1];
    const { result, text } = summaryOf(t, [pathOf(t, a), pathOf(t, b)], 40);
    const lines = text.trimEnd().split("\n");
    let shownNodes = 0;
    result.view.each(() => shownNodes++);
    expect(lines.length).toBe(40);
    expect(shownNodes).toBeGreaterThanOrEqual(lines.length);
    expect(lines.every((l) => /^ *[*:.] \S/.test(l))).toBe(true);
  });
});

function pathOf(t: ReturnType<typeof makeTree>, i: number): string {
  const parts: string[] = [];
  for (let c = i; t.parent[c] >= 0; c = t.parent[c]) parts.push(t.name.get(c));
  return parts.reverse().join("/");
}
