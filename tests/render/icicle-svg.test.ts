import { readFileSync } from "node:fs";
import { DOMParser, type Element } from "@xmldom/xmldom";
import type { HierarchyNode } from "d3-hierarchy";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { diffTrees } from "../../src/diff/diff-trees.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { buildTree } from "../../src/model/build-tree.js";
import type { Tree } from "../../src/model/tree.js";
import { displayWidth } from "../../src/render/display-width.js";
import {
  minBlockOf,
  pictureLayout,
  renderSvg,
  type SvgOptions,
  WIDENING_CAP,
} from "../../src/render/icicle-svg.js";
import { xmlEscape } from "../../src/render/xml-escape.js";
import { prepare, summarize } from "../../src/summarize.js";
import type { ViewNode } from "../../src/view/view-node.js";
import { arbEdited } from "../diff/edit-script.js";
import { makeIdTree } from "../diff/id-tree.js";
import { cli } from "../helpers/cli.js";
import { makeTree } from "../helpers/make-tree.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

interface Block {
  kind: string;
  title: string;
  x0: number;
  x1: number;
  y: number;
  group: Element;
  rect: Element;
}

/** Parses an SVG as XML 1.0, failing on any warning or error (parser: @xmldom/xmldom). */
function parse(svg: string) {
  const doc = new DOMParser({
    onError: (level, message) => {
      throw new Error(`${level}: ${message}`);
    },
  }).parseFromString(svg, "image/svg+xml");
  expect(doc.documentElement?.tagName).toBe("svg");
  return doc;
}

/** The icicle's blocks: each a group with a title and one rect. */
function blocksOf(svg: string): Block[] {
  const doc = parse(svg);
  const icicle = [...doc.getElementsByTagName("g")].find((g) => g.getAttribute("class") === "icicle")!;
  const blocks: Block[] = [];
  for (const group of [...icicle.childNodes].filter((n): n is Element => n.nodeType === 1)) {
    const rects = group.getElementsByTagName("rect");
    expect(rects.length).toBe(1);
    const rect = rects[0];
    const x0 = Number(rect.getAttribute("x"));
    blocks.push({
      kind: group.getAttribute("class")!,
      title: group.getElementsByTagName("title")[0].textContent!,
      x0,
      x1: x0 + Number(rect.getAttribute("width")),
      y: Number(rect.getAttribute("y")),
      group,
      rect,
    });
  }
  expect(icicle.getElementsByTagName("rect").length).toBe(blocks.length);
  return blocks;
}

/** Blocks of the next row lying within `parent`. */
function beneath(blocks: Block[], parent: Block): Block[] {
  const rows = [...new Set(blocks.map((b) => b.y))].sort((a, b) => a - b);
  const next = rows[rows.indexOf(parent.y) + 1];
  return blocks
    .filter((b) => b.y === next && b.x0 >= parent.x0 - 0.015 && b.x1 <= parent.x1 + 0.015)
    .sort((a, b) => a.x0 - b.x0);
}

const width = (b: Block) => b.x1 - b.x0;
const sum = (bs: Block[]) => bs.reduce((s, b) => s + width(b), 0);

function shownCount(view: HierarchyNode<ViewNode>): { shown: number; folded: number } {
  let folded = 0;
  view.each((h) => {
    if (h.data.hidden) folded++;
  });
  return { shown: view.descendants().length, folded };
}

const tree = makeTree("R{A:10{A1:5{A1a:1,A1b:2},A2:3{A2a:4}},B:100{B1:6{B1a:7},B2:8}}");
const opts: SvgOptions = { units: "bytes", sizes: true };
const view = (t: Tree, foci: string[], budget: number, label?: string) =>
  summarize(prepare(t), { foci, budget, importance: "depth", label }).view;

describe("renderSvg(view, options)", () => {
  it("draws one block per shown node and one per folded remainder, as well-formed XML", () => {
    // Wide enough that no block falls below MIN_BLOCK, so nothing is grouped.
    const v = view(tree, ["A/A1"], 6);
    const blocks = blocksOf(renderSvg(v, { ...opts, width: 40000 }));
    expect(blocks.some((b) => b.kind === "group")).toBe(false);
    const { shown, folded } = shownCount(v);
    expect(folded).toBeGreaterThan(0);
    expect(blocks.filter((b) => b.kind !== "folded")).toHaveLength(shown);
    expect(blocks.filter((b) => b.kind === "folded")).toHaveLength(folded);
  });

  it("fills each block exactly with its shown children and then its folded block", () => {
    const v = view(tree, ["A/A1"], 6);
    const blocks = blocksOf(renderSvg(v, { ...opts, width: 40000 }));
    const byLabel = new Map(
      blocks.filter((b) => b.kind !== "folded").map((b) => [b.title.split("\n")[0], b]),
    );
    v.each(({ data }) => {
      const block = byLabel.get(data.label)!;
      const below = beneath(blocks, block);
      expect(below.map((b) => (b.kind === "folded" ? "+" : b.title.split("\n")[0]))).toEqual([
        ...data.children.map((c) => c.label),
        ...(data.hidden ? ["+"] : []),
      ]);
      if (below.length > 0) expect(sum(below)).toBeCloseTo(width(block), 1);
    });
  });

  it("sizes a leaf or folded block by its size, or by its node count when the input has no sizes", () => {
    // Shown: R, A and C, with C's three children folded and R's child B folded.
    const v = view(makeTree("R{A:2,B:6,C{C1:1,C2:1,C3:1}}"), [], 3);
    const row = (sizes: boolean) => {
      const blocks = blocksOf(renderSvg(v, { ...opts, sizes }));
      const below = beneath(blocks, blocks[0]);
      expect(below.map((b) => b.title.split("\n")[0].split(":")[0])).toEqual([
        "A",
        "C",
        "+1 hidden under R (1 child and all below them)",
      ]);
      return below.map((b) => width(b) / width(below[0]));
    };
    const [, c, folded] = row(true);
    expect(c).toBeCloseTo(3 / 2, 3);
    expect(folded).toBeCloseTo(6 / 2, 3);
    const [, c2, folded2] = row(false);
    expect(c2).toBeCloseTo(3, 3);
    expect(folded2).toBeCloseTo(1, 3);
  });

  it("shares by leaves when every size is 0, a lone folded remainder included", () => {
    const t = makeTree("R{a:0{a1:0,a2:0},b:0}");
    const svg = renderSvg(view(t, [], 1), opts);
    expect(svg).not.toContain("NaN");
    const blocks = blocksOf(svg);
    expect(blocks.map((b) => b.kind)).toEqual(["other", "folded"]);
    expect(width(blocks[1])).toBeCloseTo(width(blocks[0]), 1);
  });

  it("keeps a tiny focus visible and wide enough for its label", () => {
    const t = makeTree("R{big:1000000000,tiny:1}");
    const blocks = blocksOf(renderSvg(view(t, ["tiny"], 10), opts));
    const tiny = blocks.find((b) => b.kind === "focus")!;
    expect(width(tiny)).toBeGreaterThanOrEqual(3.99);
    expect(sum(beneath(blocks, blocks[0]))).toBeCloseTo(width(blocks[0]), 1);
  });

  it("widens a focus and its ancestors so that their labels fit, and says so in the legend", () => {
    const t = makeTree("R{huge:1000000{h1:500000,h2:500000},small:10{focus-with-a-long-name:1,other:9}}");
    const svg = renderSvg(view(t, ["small/focus-with-a-long-name"], 10), opts);
    const blocks = blocksOf(svg);
    for (const name of ["small", "focus-with-a-long-name"]) {
      const block = blocks.find((b) => b.title.startsWith(`${name}\n`))!;
      expect(block.group.getElementsByTagName("text")[0].textContent).toBe(name);
    }
    const cap = Math.round(100 * WIDENING_CAP);
    expect(svg).toMatch(
      new RegExp(
        `width: size; \\d+(\\.\\d)?% of the width is widened to fit labels \\(the path to a focus, narrow blocks; at most ${cap}%\\)<`,
      ),
    );
    // Nothing narrow and no focus: nothing widened, and the legend says width is size alone.
    const plain = renderSvg(view(makeTree("R{a:5,b:7}"), [], 10), opts);
    expect(plain).toContain("width: size<");
  });

  it("gives a focus a thick outline and a fill of its own, and its ancestors a bar", () => {
    const blocks = blocksOf(renderSvg(view(tree, ["A/A1"], 6), opts));
    const focus = blocks.filter((b) => b.kind === "focus");
    expect(focus.map((b) => b.title.split("\n")[0])).toEqual(["A1"]);
    const other = blocks.find((b) => b.kind === "other")!;
    expect(focus[0].rect.getAttribute("stroke-width")).toBe("3");
    expect(focus[0].rect.getAttribute("fill")).not.toBe(other.rect.getAttribute("fill"));
    expect(focus[0].rect.getAttribute("stroke")).not.toBe(other.rect.getAttribute("stroke"));
    expect(focus[0].title).toContain("focus");
    const path = blocks.filter((b) => b.kind === "path");
    expect(path.map((b) => b.title.split("\n")[0])).toEqual(["R", "A"]);
    for (const b of path) expect(b.group.getElementsByTagName("path").length).toBe(1);
    expect(other.group.getElementsByTagName("path").length).toBe(0);
  });

  it("labels only what fits, cut at the end, and keeps the full label in the tooltip", () => {
    const long = "a-rather-long-name-that-will-never-fit-in-a-narrow-block";
    const t = makeTree(`R{${long}:1,wide:500}`);
    const blocks = blocksOf(renderSvg(view(t, [], 10), { ...opts, width: 300 }));
    const narrow = blocks.find((b) => b.title.startsWith(long))!;
    expect(narrow.title.split("\n")[0]).toBe(long);
    const texts = [...narrow.group.getElementsByTagName("text")].map((e) => e.textContent!);
    expect(texts.every((s) => s !== long)).toBe(true);
    for (const b of blocks)
      for (const e of [...b.group.getElementsByTagName("text")]) {
        const px = Number(e.getAttribute("font-size"));
        expect(displayWidth(e.textContent!) * px * 0.6).toBeLessThanOrEqual(width(b));
      }
    const wide = blocks.find((b) => b.title.startsWith("wide"))!;
    expect(wide.group.getElementsByTagName("text")[0].textContent).toBe("wide");
    const cut = texts.find((t) => t.endsWith("…"));
    if (cut) expect(long.startsWith(cut.slice(0, -1))).toBe(true);
  });

  it("keeps widths proportional to size but for the focus path's widening, at most WIDENING_CAP of the width", () => {
    const t = makeTree("R{huge:1000000{h1:500000,h2:500000},small:10{focus-with-a-long-name:1,other:9}}");
    const blocks = blocksOf(
      renderSvg(view(t, ["small/focus-with-a-long-name"], 10), { ...opts, width: 1000 }),
    );
    const inner = 1000 - 20;
    const huge = blocks.find((b) => b.title.startsWith("huge\n"))!;
    const small = blocks.find((b) => b.title.startsWith("small\n"))!;
    // By size alone, small would be 10 / 1,000,010 of the width: its widening takes the rest.
    expect(width(small)).toBeGreaterThan(inner * (10 / 1000010));
    expect(width(small)).toBeLessThanOrEqual(inner * WIDENING_CAP + 0.01);
    expect(width(huge)).toBeGreaterThanOrEqual(inner * (1 - WIDENING_CAP) - 0.01);
    // Blocks off the path keep the proportion among themselves.
    const h1 = blocks.find((b) => b.title.startsWith("h1\n"))!;
    const h2 = blocks.find((b) => b.title.startsWith("h2\n"))!;
    expect(width(h1)).toBeCloseTo(width(h2), 1);
  });

  it("writes every text at a contrast ratio of at least 4.5:1 on what lies under it (WCAG 2.x, 1.4.3)", () => {
    // WCAG 2.x: relative luminance of sRGB colours and the contrast ratio (L1 + 0.05) / (L2 + 0.05),
    // success criterion 1.4.3 (Contrast, Minimum) asks 4.5:1 for text.
    const r = diffTrees(
      makeIdTree("R{A{x:1,y:1},B{z:1},C:2,D:3,F:1}"),
      makeIdTree("R{A{y:1},B{z:1,x:1},E:1,D:9,G:1}"),
      {
        foci: ["B"],
        budget: 40,
        importance: "depth",
      },
    );
    const svg = renderSvg(r.view, {
      units: "plain",
      sizes: true,
      changeOf: (n) => n.change,
      heading: "diff",
    });
    const doc = parse(svg);
    const fills = new Set<string>();
    for (const rect of [...doc.getElementsByTagName("rect")]) {
      const fill = rect.getAttribute("fill")!;
      if (fill.startsWith("#")) fills.add(fill);
    }
    // The folded blocks' hatch: its ground and its lines are both under the text.
    for (const e of [...doc.getElementsByTagName("pattern")[0].childNodes].filter(
      (n): n is Element => n.nodeType === 1,
    )) {
      const c = e.getAttribute("fill") ?? e.getAttribute("stroke");
      if (c?.startsWith("#")) fills.add(c);
    }
    const fillOf = (e: Element): string => {
      for (let n: Element | null = e; n; n = n.parentNode as Element | null) {
        const f = n.getAttribute?.("fill");
        if (f) return f;
      }
      return "#000000";
    };
    const inks = new Set([...doc.getElementsByTagName("text")].map(fillOf));
    expect(inks.size).toBeGreaterThan(0);
    for (const ink of inks)
      for (const fill of fills)
        expect(contrastRatio(ink, fill), `${ink} on ${fill}`).toBeGreaterThanOrEqual(4.5);
  });

  it("keeps each change kind's shape visible under colour-vision deficiency (Machado et al. 2009)", () => {
    // Kinds differ by shape (checked below in 'marks each change kind'); here each shape or outline must
    // stay visible against its own fill, at least 3:1 (WCAG 2.x, 1.4.11 Non-text Contrast), when both
    // colours go through the simulation matrices of Machado, Oliveira & Fernandes (2009), severity 1.0.
    const r = diffTrees(
      makeIdTree("R{A{x:1,y:1},B{z:1},C:2,D:3,F:1}"),
      makeIdTree("R{A{y:1},B{z:1,x:1},E:1,D:9,G:1}"),
      {
        foci: [],
        budget: 40,
        importance: "depth",
      },
    );
    const doc = parse(renderSvg(r.view, { units: "plain", sizes: true, changeOf: (n) => n.change }));
    const legend = [...doc.getElementsByTagName("g")].find((g) => g.getAttribute("class") === "legend")!;
    let checked = 0;
    for (const item of [...legend.getElementsByTagName("g")]) {
      const rect = item.getElementsByTagName("rect")[0];
      const word = item.getElementsByTagName("text")[0]?.textContent;
      if (!rect || !["added", "removed", "moved", "renamed", "resized"].includes(word ?? "")) continue;
      const fill = rect.getAttribute("fill")!;
      const mark =
        word === "removed"
          ? rect.getAttribute("stroke")!
          : (item.getElementsByTagName("path")[0] ?? item.getElementsByTagName("circle")[0]).getAttribute(
              "fill",
            )!;
      for (const [cvd, m] of Object.entries(MACHADO_2009))
        expect(
          contrastRatio(simulate(m, mark), simulate(m, fill)),
          `${word} under ${cvd}`,
        ).toBeGreaterThanOrEqual(3);
      checked++;
    }
    expect(checked).toBe(5);
  });

  it("escapes every name: markup in a name stays text and no script element exists", () => {
    const evil = `</text><script>alert(1)</script>&"'`;
    const t = buildTree({
      parentOf: Int32Array.from([-1, 0, 0]),
      name: ["root", evil, "x]]>"],
      ownSize: Float64Array.from([0, 5, 5]),
      hasSizes: true,
      ids: null,
      origin: new Int32Array(3),
      originIsRow: false,
      fields: new Map(),
      rootName: "(root)",
    });
    const svg = renderSvg(view(t, [], 10), opts);
    const doc = parse(svg);
    expect(doc.getElementsByTagName("script").length).toBe(0);
    expect(svg).not.toContain("<script");
    const blocks = blocksOf(svg);
    expect(blocks.map((b) => b.title.split("\n")[0])).toContain(evil);
    const texts = [...doc.getElementsByTagName("text")].map((e) => e.textContent);
    expect(texts).toContain(evil);
  });

  it("xmlEscape(text) escapes the five XML specials and drops what XML 1.0 forbids", () => {
    // XML 1.0 (Fifth Edition), section 2.2 (Char) and 4.6 (predefined entities).
    expect(xmlEscape(`<a href="x">&'</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;&amp;&apos;&lt;/a&gt;");
    expect(xmlEscape("a\u0001b\ud800c\uffff")).toBe("a\ufffdb\ufffdc\ufffd");
    expect(xmlEscape("tab\tline\n\u{1f333}")).toBe("tab\tline\n\u{1f333}");
  });

  it("writes no coordinate with more than two decimals", () => {
    expect(renderSvg(view(tree, ["A/A1"], 6), opts)).not.toMatch(/\d\.\d{3,}/);
  });

  it("fills every block, labels every block and accounts for every node, for any tree, focus, budget and width (property)", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(40),
        fc.integer({ min: 1, max: 25 }),
        fc.boolean(),
        fc.integer({ min: 150, max: 1600 }),
        ([t, foci], budget, sizes, w) => {
          const prepared = prepare(t);
          const paths = foci.map((i) => prepared.index.path(i));
          // Enough lines for the root and every focus path.
          const needed = foci.reduce((n, i) => n + t.depth[i], 1);
          const r = summarize(prepared, { foci: paths, budget: budget + needed, importance: "depth" });
          checkPicture(r.view, { units: "plain", sizes, width: w });
        },
      ),
      { numRuns: 80 },
    );
  });

  it("labels or groups every block of a diff picture too, for any edit, budget and width (property)", () => {
    fc.assert(
      fc.property(
        arbEdited(),
        fc.integer({ min: 2, max: 30 }),
        fc.integer({ min: 150, max: 1600 }),
        fc.boolean(),
        ({ oldTree, newTree }, budget, w, sizes) => {
          const r = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth" });
          checkPicture(r.view, {
            units: "plain",
            sizes,
            width: w,
            changeOf: (n) => n.change,
            changesIn: (n, folded) => (folded ? n.hidden!.changes : n.changes),
          });
        },
      ),
      { numRuns: 80 },
    );
  });

  it("keeps a busy diff's widening within WIDENING_CAP and says what gave way (tidewater listing)", () => {
    // A second version of the fictional tidewater file listing, as `npm run screenshots` derives it:
    // every 37th file removed, every 23rd grown by half, six files added under one folder. Before the
    // cap, the paths to its changes took about 61% of the picture's width.
    const lines = readFileSync(new URL("../../fixtures/tidewater-files.paths", import.meta.url), "utf8")
      .trimEnd()
      .split("\n");
    const changed: string[] = [];
    lines.forEach((line, k) => {
      const [size, path] = line.split("\t");
      if (k > 0 && k % 37 === 0 && !lines[k + 1]?.split("\t")[1].startsWith(`${path}/`)) return;
      changed.push(k > 0 && k % 23 === 0 ? `${Math.round(Number(size) * 1.5)}\t${path}` : line);
    });
    for (let k = 0; k < 6; k++) changed.push(`${2048 * (k + 1)}\t./services/ledger/src/tide-gauge-${k}.ts`);
    const load = (text: string) => loadTree(text, { ...defaultLoadOptions, file: "files.paths" });
    for (const [budget, w] of [
      [40, 1200],
      [80, 800],
      [25, 300],
    ]) {
      const r = diffTrees(load(`${lines.join("\n")}\n`), load(`${changed.join("\n")}\n`), {
        foci: [],
        budget,
        importance: "depth",
      });
      const options: SvgOptions<(typeof r.view)["data"]> = {
        units: "bytes",
        sizes: true,
        width: w,
        changeOf: (n) => n.change,
        changesIn: (n, folded) => (folded ? n.hidden!.changes : n.changes),
      };
      checkPicture(r.view, options);
      const { widened, pathGrouped } = pictureLayout(r.view, options);
      expect(widened).toBeLessThanOrEqual((w - 20) * WIDENING_CAP + 1e-6);
      const words = legendWords(renderSvg(r.view, options));
      expect(words).toContain(`at most ${Math.round(100 * WIDENING_CAP)}%`);
      if (pathGrouped > 0)
        expect(words).toContain(
          `${pathGrouped} nodes on the path to a focus or change are drawn inside groups`,
        );
    }
  });

  it("draws a focus inside a group when showing it would pass the cap, outlined and named in the tooltip", () => {
    // At 200 pixels, a focus five levels down a branch of 1 in 10,000 cannot have blocks of its own
    // without taking far more than WIDENING_CAP of the width.
    const t = makeTree("R{big:10000{b1:5000,b2:5000},tiny:1{s:1{u:1{v:1{f:1,g:1},w:1},x:1},y:1}}");
    const v = view(t, ["tiny/s/u/v/f"], 20);
    const svg = renderSvg(v, { ...opts, width: 200 });
    const { widened, pathGrouped } = pictureLayout(v, { ...opts, width: 200 });
    expect(widened).toBeLessThanOrEqual(180 * WIDENING_CAP + 1e-6);
    expect(pathGrouped).toBeGreaterThan(0);
    const blocks = blocksOf(svg);
    expect(blocks.some((b) => b.kind === "focus")).toBe(false);
    const holder = blocks.filter((b) => b.kind === "group" && b.title.includes("holds the focus f"));
    expect(holder).toHaveLength(1);
    expect(holder[0].rect.getAttribute("stroke-width")).toBe("3");
    const words = legendWords(svg);
    expect(words).toContain("a group with a focus inside");
    expect(words).toContain(
      `${pathGrouped} ${pathGrouped === 1 ? "node" : "nodes"} on the path to a focus ${pathGrouped === 1 ? "is" : "are"} drawn inside groups`,
    );
    // Wide enough, the same focus has its own block and no group holds it.
    const wide = blocksOf(renderSvg(v, { ...opts, width: 4000 }));
    expect(wide.filter((b) => b.kind === "focus")).toHaveLength(1);
    expect(wide.some((b) => b.title.includes("holds the focus"))).toBe(false);
  });

  it("writes a fold's count of hidden nodes in the one number style, compact when the block is narrow", () => {
    // Budget 3: the root, two children and a fold of the other 12,345 (each as big as all of `a`).
    const kids = Array.from({ length: 12346 }, (_, k) => `c${k}:1000`).join(",");
    const v = view(makeTree(`R{a:1000,${kids}}`), [], 3);
    const label = (w: number) => {
      const fold = blocksOf(renderSvg(v, { ...opts, width: w })).find((b) => b.kind === "folded")!;
      return [fold.group.getElementsByTagName("text")[0].textContent, fold.title.split(":")[0]];
    };
    // The fold counts the nodes it hides (here each hidden child is a leaf: 12,345 of each).
    expect(label(1200)).toEqual([
      "+12,345 hidden",
      "+12,345 hidden under R (12,345 children and all below them)",
    ]);
    // Six columns of label or fewer: the compact count (from 10,000 up).
    const tiny = Array.from({ length: 12345 }, (_, k) => `c${k}:1`).join(",");
    const narrow = view(makeTree(`R{a:1000000000000,b:1000000000000,${tiny}}`), [], 3);
    const fold = blocksOf(renderSvg(narrow, { ...opts, width: 1200 })).find((b) => b.title.startsWith("+"))!;
    expect(fold.title.split(":")[0]).toBe("+12,345 hidden under R (12,345 children and all below them)");
    expect(fold.group.getElementsByTagName("text")[0].textContent).toBe("+12.3k");
  });

  it("labels a fold with the nodes it hides, not its children, and the legend says so (field test)", () => {
    // Budget 2: R and B shown; B's 3 children folded, and R's child A with its 2 children (3 nodes in
    // 1 child). The folds say +3 and +3, as the text format's (3 hidden) does, so R's 8 nodes = 1 + B's
    // 4 + 3 reads off the picture; the tooltips say how many children.
    const v = view(makeTree("R{A:1{a1:1,a2:1},B:6{b1:1,b2:1,b3:1}}"), [], 2);
    const svg = renderSvg(v, { ...opts, width: 1200 });
    const folds = blocksOf(svg).filter((b) => b.kind === "folded");
    expect(folds.map((f) => f.group.getElementsByTagName("text")[0].textContent)).toEqual([
      "+3 hidden",
      "+3 hidden",
    ]);
    expect(folds.map((f) => f.title).sort()).toEqual([
      "+3 hidden under B (3 children and all below them): 3 nodes, 3 B",
      "+3 hidden under R (1 child and all below them): 3 nodes, 3 B",
    ]);
    expect(svg).toContain("+N hidden: N nodes not drawn");
    expect(svg).not.toContain("+N more");
  });

  it("takes --width in columns, 8 pixels each, and refuses a width under 30 columns as text does", async () => {
    const args = ["fixtures/tidewater-files.paths", "--format", "svg", "--budget", "12"];
    const wide = await cli([...args, "--width", "30"]);
    expect(wide.code).toBe(0);
    expect(wide.stdout).toMatch(/^<svg [^>]*width="240"/);
    for (const diff of [[], ["diff", "fixtures/examples/packages-main.paths"]]) {
      const narrow = await cli([...diff, ...args, "--width", "3"]);
      expect(narrow.code).toBe(2);
      expect(narrow.stdout).toBe("");
      expect(narrow.stderr).toMatch(/^espalier: a width of 3 columns is too narrow; .*\[USAGE\]\n$/);
    }
  });

  it("keeps a size on a narrow block in whole units of bytes when one decimal does not fit", () => {
    // Ten files of 1,929,380 bytes fold into 19,293,800 bytes = 18.4 MiB (IEC 80000-13: Mi = 2^20),
    // a sliver beside two huge siblings: widened to the narrowest block, seven columns of numbers.
    const files = Array.from({ length: 10 }, (_, k) => `c${k}:1929380`).join(",");
    const v = view(makeTree(`R{a:1000000000000,b:1000000000000,${files}}`), [], 3);
    const fold = blocksOf(renderSvg(v, { units: "bytes", sizes: true })).find((b) => b.kind === "folded")!;
    expect(width(fold)).toBeLessThan(60);
    expect([...fold.group.getElementsByTagName("text")].map((e) => e.textContent)).toEqual(["+10", "18 MiB"]);
    expect(fold.title).toContain("18.4 MiB");
  });

  it("writes each block's change in words inside it, and what changed inside a fold", () => {
    const r = diffTrees(
      makeIdTree("R{A{x:1,y:1},B{z:1},C:2,D:3,H{h1:1,h2:1,h3:1}}"),
      makeIdTree("R{A{y:1},B{z:1,x:1},E:1,D:9,H{h1:1,h3:5}}"),
      { foci: [], budget: 8, importance: "depth" },
    );
    const svg = renderSvg(r.view, {
      units: "plain",
      sizes: true,
      width: 3000,
      changeOf: (n) => n.change,
      changesIn: (n, folded) => (folded ? n.hidden!.changes : n.changes),
    });
    const blocks = blocksOf(svg);
    const texts = (b: Block) => [...b.group.getElementsByTagName("text")].map((e) => e.textContent!);
    let changed = 0;
    for (const b of blocks) {
      const kind = ["added", "removed", "moved", "renamed", "edited", "resized"].find((k) =>
        b.kind.split(" ").includes(k),
      );
      if (kind) {
        expect(
          texts(b).some((t) => t.startsWith(kind)),
          `${b.title}`,
        ).toBe(true);
        changed++;
      }
    }
    expect(changed).toBeGreaterThan(0);
    // H's fold hides one removed (h2) and one resized (h3) node, and says so.
    const fold = blocks.find((b) => b.kind === "folded" && b.title.includes("under H"))!;
    expect(texts(fold)).toContain("1 removed, 1 resized");
  });

  it("marks each change kind of a diff by a shape or outline besides its tint, with a legend", () => {
    const r = diffTrees(
      makeIdTree("R{A{x:1,y:1},B{z:1},C:2,D:3}"),
      makeIdTree("R{A{y:1},B{z:1,x:1},E:1,D:9}"),
      {
        foci: [],
        budget: 40,
        importance: "depth",
      },
    );
    const svg = renderSvg(r.view, { units: "plain", sizes: true, changeOf: (n) => n.change });
    const blocks = blocksOf(svg);
    const kindOf = (name: string) => blocks.find((b) => b.title.startsWith(`${name}\n`))!;
    expect(kindOf("x").kind).toContain("moved");
    expect(kindOf("E").kind).toContain("added");
    expect(kindOf("C").kind).toContain("removed");
    expect(kindOf("D").kind).toContain("resized");
    expect(kindOf("C").rect.getAttribute("stroke-dasharray")).not.toBeNull();
    expect(kindOf("y").rect.getAttribute("stroke-dasharray")).toBeNull();
    // One shape each: a corner triangle (added), a diamond (moved), a bar (resized); none for removed.
    const marks = (name: string) =>
      [...kindOf(name).group.getElementsByTagName("path")].map((e) => e.getAttribute("d"));
    expect(marks("E")).toHaveLength(1);
    expect(marks("x")).toHaveLength(1);
    expect(marks("D")).toHaveLength(1);
    expect(
      new Set([...marks("E"), ...marks("x"), ...marks("D")].map((d) => d!.replace(/[\d.\s-]+/g, ""))),
    ).toHaveProperty("size", 3);
    expect(marks("C")).toHaveLength(0);
    expect(marks("y")).toHaveLength(0);
    const legend = [...parse(svg).getElementsByTagName("g")].find(
      (g) => g.getAttribute("class") === "legend",
    )!;
    const words = [...legend.getElementsByTagName("text")].map((e) => e.textContent);
    expect(words).toEqual(expect.arrayContaining(["added", "removed", "moved", "renamed", "resized"]));
    expect(words).not.toContain("focus");
  });
});

/**
 * The picture's promises, whatever the tree: the row beneath a block fills it; every block is at
 * least MIN_BLOCK wide and carries a label that fits it (no unlabelled sliver); every shown node and
 * every folded remainder is drawn once, as its own block or inside a group (with all below it); the
 * leaves' weights add up to the root's; and the legend's widening is what the blocks have beyond
 * their share by weight.
 */
function checkPicture<T extends ViewNode>(v: HierarchyNode<T>, options: SvgOptions<T>) {
  const svg = renderSvg(v, options);
  const blocks = blocksOf(svg);
  const rows = [...new Set(blocks.map((b) => b.y))].sort((a, b) => a - b);
  for (const b of blocks) {
    const below = beneath(blocks, b);
    if (below.length > 0) expect(Math.abs(sum(below) - width(b))).toBeLessThan(0.01 * (below.length + 1));
    // Every block below the first row lies within one block of the row above.
    if (b.y !== rows[0]) {
      const above = rows[rows.indexOf(b.y) - 1];
      expect(blocks.filter((p) => p.y === above && beneath(blocks, p).includes(b))).toHaveLength(1);
    }
    expect(width(b)).toBeGreaterThanOrEqual(minBlockOf(options) - 0.02);
    const texts = [...b.group.getElementsByTagName("text")];
    expect(texts.length, `unlabelled block ${b.title}`).toBeGreaterThan(0);
    expect(texts[0].textContent!.length).toBeGreaterThan(0);
    // In a diff, a fold or a group says what changed inside it before its size, however narrow.
    if (options.changesIn && (b.kind === "folded" || b.kind === "group"))
      expect(texts[1]?.textContent, b.title).toMatch(
        /^(none changed|\d[\d,.]*k? changed|\d[\d,]* (added|removed|moved|renamed|edited|resized|linked|unlinked)(, |$))/,
      );
    // 0.6 em per column: common practice for monospace faces, no source (the renderer assumes 0.62).
    for (const e of texts)
      expect(displayWidth(e.textContent!) * Number(e.getAttribute("font-size")) * 0.6).toBeLessThanOrEqual(
        width(b),
      );
  }
  // The heading and the legend stay inside the picture (0.6 em per column, as above).
  const picture = Number(parse(svg).documentElement!.getAttribute("width"));
  for (const e of [...parse(svg).getElementsByTagName("text")]) {
    const px = Number(e.getAttribute("font-size") || 12);
    expect(displayWidth(e.textContent!) * px * 0.6).toBeLessThanOrEqual(picture - 20);
  }
  // Accounting, on the layout the picture draws.
  const { blocks: laid, widened } = pictureLayout(v, options);
  expect(laid).toHaveLength(blocks.length);
  const drawn = new Set<T>();
  const foldedDrawn = new Set<T>();
  for (const b of laid) {
    if (b.members)
      for (const m of b.members) {
        if (m.folded) foldedDrawn.add(m.node);
        else
          for (const d of v.find((h) => h.data === m.node)!.descendants()) {
            drawn.add(d.data);
            if (d.data.hidden) foldedDrawn.add(d.data);
          }
      }
    else if (b.folded) {
      expect(foldedDrawn.has(b.node)).toBe(false);
      foldedDrawn.add(b.node);
    } else {
      expect(drawn.has(b.node)).toBe(false);
      drawn.add(b.node);
    }
  }
  expect(drawn.size).toBe(v.descendants().length);
  expect(foldedDrawn.size).toBe(v.descendants().filter((h) => h.data.hidden).length);
  const leaves = laid.filter((b) => b.leaf);
  const inner = laid[0].x1 - laid[0].x0;
  const total = laid[0].weight;
  expect(leaves.reduce((s, b) => s + b.weight, 0)).toBeCloseTo(total, 6);
  const beyond = leaves.reduce((s, b) => s + Math.max(0, b.x1 - b.x0 - (b.weight / total) * inner), 0);
  expect(widened).toBeCloseTo(beyond, 6);
  // All widening together keeps to the cap, whatever the tree, focus, budget and width.
  expect(beyond).toBeLessThanOrEqual(WIDENING_CAP * inner + 1e-6 * inner);
  const words = legendWords(svg);
  const stated = /(\d+(?:\.\d)?)% of the width is widened/.exec(words);
  if (beyond / inner >= 0.0005) {
    // The legend rounds: a whole percent from 1% up, one decimal under it. A printed figure is within
    // half its last digit of the true share, a tie included (27.5% is printed 28%).
    const half = stated?.[1].includes(".") ? 0.05 : 0.5;
    expect(Math.abs(Number(stated?.[1]) - (100 * beyond) / inner)).toBeLessThanOrEqual(half + 1e-9);
  } else expect(stated).toBeNull();
}

/** The legend's words, its wrapped lines joined again. */
function legendWords(svg: string): string {
  const legend = [...parse(svg).getElementsByTagName("g")].find((g) => g.getAttribute("class") === "legend")!;
  return [...legend.getElementsByTagName("text")].map((e) => e.textContent).join(" ");
}

/** WCAG 2.x relative luminance of an sRGB colour `#rrggbb` (definition in WCAG 2.2, "relative luminance"). */
function luminance(hex: string): number {
  const n = Number.parseInt(hex.slice(1), 16);
  const lin = (c: number) => {
    const v = c / 255;
    return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(n >> 16) + 0.7152 * lin((n >> 8) & 255) + 0.0722 * lin(n & 255);
}

/** WCAG 2.x contrast ratio (L1 + 0.05) / (L2 + 0.05), L1 the lighter. */
function contrastRatio(a: string, b: string): number {
  const [l1, l2] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (l1 + 0.05) / (l2 + 0.05);
}

// Machado, Oliveira & Fernandes, "A Physiologically-based Model for Simulation of Color Vision
// Deficiency", IEEE TVCG 15(6), 2009: the published matrices for severity 1.0, applied to linear RGB.
// Protanomaly and deuteranomaly rows checked against a public copy of the paper's table; the
// tritanomaly rows are from memory.
const MACHADO_2009: Record<string, number[][]> = {
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

/** `#rrggbb` as seen through a simulation matrix: sRGB decoded to linear, multiplied, encoded back (IEC 61966-2-1). */
function simulate(m: number[][], hex: string): string {
  const n = Number.parseInt(hex.slice(1), 16);
  const lin = [n >> 16, (n >> 8) & 255, n & 255].map((c) => {
    const v = c / 255;
    return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
  });
  const out = m.map((row) => Math.min(1, Math.max(0, row[0] * lin[0] + row[1] * lin[1] + row[2] * lin[2])));
  const enc = out.map((v) => Math.round(255 * (v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055)));
  return `#${enc.map((c) => c.toString(16).padStart(2, "0")).join("")}`;
}
