import { Parser } from "commonmark";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildTree } from "../../src/model/build-tree.js";
import { shownLabel } from "../../src/model/safe-text.js";
import { markdownText } from "../../src/render/markdown-escape.js";
import { renderMarkdown } from "../../src/render/summary-markdown.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { makeTree } from "../helpers/make-tree.js";

type MdNode = NonNullable<ReturnType<Parser["parse"]>["firstChild"]>;

/** Items of every list in document order, with the literal text of each item's first paragraph. */
function listItems(markdown: string): { text: string; depth: number; html: boolean }[] {
  // Parsed with commonmark.js, the CommonMark reference implementation in JavaScript (registry: commonmark).
  const doc = new Parser().parse(markdown);
  const items: { text: string; depth: number; html: boolean }[] = [];
  const walker = doc.walker();
  let ev = walker.next();
  let depth = -1;
  while (ev) {
    const node = ev.node as MdNode;
    if (node.type === "item") {
      depth += ev.entering ? 1 : -1;
      if (ev.entering) {
        let text = "";
        let html = false;
        const para = node.firstChild!;
        const inner = para.walker();
        let e = inner.next();
        while (e) {
          if (e.entering && (e.node.type === "text" || e.node.type === "code")) text += e.node.literal;
          if (e.node.type === "html_inline" || e.node.type === "html_block") html = true;
          e = inner.next();
        }
        items.push({ text, depth, html });
      }
    }
    ev = walker.next();
  }
  expect(depth).toBe(-1);
  return items;
}

function treeWithNames(names: string[]) {
  return buildTree({
    parentOf: Int32Array.from(names.map((_, i) => (i === 0 ? -1 : i < 3 ? 0 : 1))),
    name: names,
    ownSize: Float64Array.from(names.map((_, i) => i)),
    hasSizes: true,
    ids: null,
    origin: new Int32Array(names.length),
    originIsRow: false,
    fields: new Map(),
    rootName: "(root)",
  });
}

describe("renderMarkdown(view, options)", () => {
  it("writes a CommonMark nested list with one item per line of the text rendering", () => {
    const tree = makeTree("R{A:10{A1:5{A1a:1,A1b:2},A2:3{A2a:4}},B:100{B1:6{B1a:7},B2:8}}");
    const result = summarize(prepare(tree), { foci: ["A/A1"], budget: 6, importance: "depth" });
    const md = renderMarkdown(result.view, { units: "bytes", sizes: true });
    const text = renderText(result.view, { units: "bytes", sizes: true });
    const items = listItems(md);
    expect(items).toHaveLength(text.trimEnd().split("\n").length);
    expect(items.map((i) => i.depth)).toEqual([0, 1, 2, 3, 3, 2]);
    expect(items[2].text).toContain("A1 (focus)");
    expect(items[0].text).toContain("(hidden: 1 child, 4 nodes, 121 B)");
  });

  it("keeps mentions, issue references and URLs in labels as code, never links (checked with commonmark.js)", () => {
    // GitHub Flavored Markdown 0.29 (section 6.9, extended autolinks) links bare URLs and www. only in
    // text, and GitHub makes @mentions and #references only in text (common practice, no source); a
    // code span's content is not text. commonmark.js (the CommonMark reference implementation) shows
    // what the parser makes of the rest.
    const names = [
      "(root)",
      "@quill-ops",
      "#123",
      "https://tidewater.invalid/x",
      "www.tidewater.invalid",
      "<a@b.invalid>",
    ];
    const result = summarize(prepare(treeWithNames(names)), { foci: [], budget: 100, importance: "depth" });
    const md = renderMarkdown(result.view, {
      units: "plain",
      sizes: false,
      header: { budget: 100, lines: result.selection.lines, foci: ["@quill-ops"] },
    });
    const walker = new Parser().parse(md).walker();
    const code: string[] = [];
    const text: string[] = [];
    for (let e = walker.next(); e; e = walker.next()) {
      expect(["link", "image", "html_inline", "html_block"]).not.toContain(e.node.type);
      if (e.node.type === "code") code.push(e.node.literal!);
      if (e.node.type === "text") text.push(e.node.literal!);
    }
    for (const name of names) expect(code).toContain(name);
    expect(text.join("")).not.toMatch(/@|#[0-9]|https?:|www\./);
    // The source stays readable: no entity and no backslash inside a name.
    expect(md).not.toContain("&#");
    expect(md).toContain("` #123 `");
  });

  it("keeps any name literal: punctuation, HTML, emphasis and list markers cannot break the markup (property)", () => {
    const nameChars = fc.constantFrom(..."ab *_`#<>&[]()!|\\~-+1.:\"'{}=$)\n\u001b".split(""));
    fc.assert(
      fc.property(
        fc.array(fc.string({ unit: nameChars, minLength: 0, maxLength: 12 }), { minLength: 3, maxLength: 8 }),
        (names) => {
          const tree = treeWithNames(names);
          const result = summarize(prepare(tree), { foci: [], budget: 100, importance: "depth" });
          const md = renderMarkdown(result.view, { units: "plain", sizes: false });
          const items = listItems(md);
          expect(items).toHaveLength(tree.length);
          let k = 0;
          result.view.eachBefore((h) => {
            const item = items[k++];
            expect(item.html).toBe(false);
            // The item's text is exactly the (control-escaped) label, then the numbers.
            const label = shownLabel(h.data.label);
            expect(
              item.text === label || item.text.startsWith(`${label} · `),
              `${item.text} / ${label}`,
            ).toBe(true);
          });
        },
      ),
    );
  });

  it("backslash-escapes markup characters and block starts (CommonMark 0.31 section 2.4)", () => {
    expect(markdownText("*a* <b> [c](d) #1.")).toBe("\\*a\\* \\<b> \\[c\\](d) \\#1.");
    expect(markdownText("> quote")).toBe("\\> quote");
    expect(markdownText("1. x")).toBe("1\\. x");
    expect(markdownText("- x")).toBe("\\- x");
    expect(markdownText("  x ")).toBe("&#32;&#32;x&#32;");
  });
});
