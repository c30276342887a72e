import { readFileSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { scratchDir } from "../load/facts/helpers.js";

// Fact tables in the output formats that tests/cli/facts.test.ts does not cover (Markdown, SVG, and a
// diff of two months' exports). Every number a line shows is checked against totals this file computes
// itself from the CSV text, without the engine or any espalier code: a node's rows are the rows whose
// level values start with its path, its size their cost sum, its node count the distinct prefixes
// among them.

const fixture = resolve(import.meta.dirname, "../../fixtures/quillfeather-cost-export.csv");
const LEVELS = ["--levels", "account,service,region,usage", "--size-field", "cost"];
const dir = scratchDir();

/** Per path ("" the root, names joined with "/"): subtree node count and cost sum. */
interface Totals {
  nodes: Map<string, number>;
  size: Map<string, number>;
}

/**
 * The independent pass: the export's rows (plain CSV without quotes, checked) summed into every prefix
 * of their four level values.
 */
function totalsOf(csv: string): Totals {
  const [header, ...rows] = csv.trimEnd().split("\n");
  expect(header).toBe("account,service,region,usage,day,cost");
  const size = new Map<string, number>([["", 0]]);
  for (const row of rows) {
    const cells = row.split(",");
    expect(cells.length, row).toBe(6);
    expect(row).not.toContain('"');
    const cost = Number(cells[5]);
    expect(Number.isFinite(cost), row).toBe(true);
    size.set("", (size.get("") ?? 0) + cost);
    for (let d = 1; d <= 4; d++) {
      const path = cells.slice(0, d).join("/");
      size.set(path, (size.get(path) ?? 0) + cost);
    }
  }
  const nodes = new Map<string, number>();
  for (const path of size.keys())
    nodes.set(
      path,
      [...size.keys()].filter((q) => path === "" || q === path || q.startsWith(`${path}/`)).length,
    );
  return { nodes, size };
}

/** "184,956" as a number (en-US digit groups). */
const num = (text: string) => Number(text.replaceAll(",", ""));

/**
 * A shown line: its last node's path (a chain's `top` is its first node, whose numbers the line
 * states), the numbers it states, how many names it has, and its fold's numbers (the last node's), if any.
 */
interface Shown {
  path: string;
  top: string;
  names: number;
  nodes: number;
  size: number;
  hidden?: { children: number; nodes: number; size: number };
  level: number;
}

/** The children lines of each shown line, by the nesting the format states. */
function shownChildren(lines: Shown[]): Map<Shown, Shown[]> {
  const out = new Map<Shown, Shown[]>(lines.map((l) => [l, []]));
  const stack: Shown[] = [];
  for (const line of lines) {
    while (stack.length > 0 && stack[stack.length - 1].level >= line.level) stack.pop();
    if (stack.length > 0) out.get(stack[stack.length - 1])?.push(line);
    stack.push(line);
  }
  return out;
}

/** Every line's numbers equal the independent totals, and each fold is what its shown children leave. */
function expectTotals(lines: Shown[], totals: Totals): void {
  for (const line of lines) {
    expect([line.top, line.nodes, line.size]).toEqual([
      line.top,
      totals.nodes.get(line.top),
      totals.size.get(line.top),
    ]);
  }
  for (const [line, children] of shownChildren(lines)) {
    const shown = (f: (l: Shown) => number) => children.reduce((s, c) => s + f(c), 0);
    const under = [...totals.nodes.keys()].filter(
      (q) =>
        q !== line.path &&
        (line.path === ""
          ? !q.includes("/")
          : q.startsWith(`${line.path}/`) && !q.slice(line.path.length + 1).includes("/")),
    );
    if (children.length === under.length) {
      expect(line.hidden, line.path).toBeUndefined();
      continue;
    }
    expect(line.hidden, line.path).toEqual({
      children: under.length - children.length,
      nodes: line.nodes - line.names - shown((c) => c.nodes),
      size: line.size - shown((c) => c.size),
    });
  }
}

/**
 * The list items of a Markdown summary: `- ` nested two spaces a level, names as code spans joined
 * by " / " along a chain, then " · numbers" and " · *(hidden: …)*".
 */
function markdownLines(markdown: string, rootName: string): Shown[] {
  const items = markdown.split("\n").filter((l) => /^ *- /.test(l));
  const paths: string[] = [];
  return items.map((item) => {
    const m =
      /^( *)- (.+?) · ((?:[\d,]+ nodes?, )?[\d,]+)(?: · \*\(hidden: (\d+) child(?:ren)?, ([\d,]+) nodes?, ([\d,]+)\)\*)?$/.exec(
        item,
      );
    expect(m, item).not.toBeNull();
    if (!m) throw new Error(item);
    const level = m[1].length / 2;
    const names = [...m[2].matchAll(/` (.+?) `/g)].map((n) => n[1]);
    const above = level === 0 ? [] : paths[level - 1] === "" ? [] : [paths[level - 1]];
    const own = names[0] === rootName ? names.slice(1) : [...above, ...names];
    const path = own.join("/");
    const top = own.slice(0, own.length - names.length + 1).join("/");
    paths[level] = path;
    const [countText, sizeText] = m[3].includes("node") ? m[3].split(/ nodes?, /) : ["1", m[3]];
    return {
      path,
      top,
      names: names.length,
      level,
      nodes: num(countText),
      size: num(sizeText),
      ...(m[4] ? { hidden: { children: Number(m[4]), nodes: num(m[5]), size: num(m[6]) } } : {}),
    };
  });
}

describe("a fact table in Markdown, SVG and diff, checked against an independent pass over the CSV", () => {
  const totals = totalsOf(readFileSync(fixture, "utf8"));

  it("the independent pass sees the export as the tool's header says (108 nodes, cost 184,956)", async () => {
    const r = await cli([fixture, ...LEVELS, "--budget", "5"]);
    expect(r.stdout.split("\n")[0]).toContain(
      `${totals.nodes.get("")} nodes, cost ${totals.size.get("")?.toLocaleString("en-US")}`,
    );
  });

  it("Markdown: every item's node count and cost, and every fold, add up to the export's rows", async () => {
    for (const args of [
      ["--focus", "qf-telemetry-prod/egress", "--budget", "12"],
      ["--focus", "qf-support/remote-desk/lowmere-east", "--budget", "20"],
      ["--budget", "30"],
    ]) {
      const r = await cli([fixture, ...LEVELS, ...args, "--format", "markdown"]);
      expect(r.stderr).toBe("");
      expect(r.code).toBe(0);
      const lines = markdownLines(r.stdout, "quillfeather-cost-export.csv");
      expect(lines.length).toBeGreaterThan(4);
      expect(lines[0].path).toBe("");
      expectTotals(lines, totals);
    }
  });

  it("SVG: each box's tooltip states its node's node count and cost; each folded box its remainder", async () => {
    const r = await cli([
      fixture,
      ...LEVELS,
      "--focus",
      "qf-telemetry-prod/egress",
      "--budget",
      "14",
      "--format",
      "svg",
    ]);
    expect(r.stderr).toBe("");
    const boxes = [...r.stdout.matchAll(/<g class="(\w+)"><title>([^<]*)<\/title>/g)].map((m) => ({
      kind: m[1],
      lines: m[2].split("\n"),
    }));
    const amount = (text: string): [number, number] => {
      const m = /^(?:([\d,]+) nodes?, )?([\d,]+)$/.exec(text);
      expect(m, text).not.toBeNull();
      return m ? [m[1] === undefined ? 1 : num(m[1]), num(m[2])] : [Number.NaN, Number.NaN];
    };
    const isAmount = (line: string) => /^(?:[\d,]+ nodes?, )?[\d,]+$/.test(line);
    const focusPath = ["qf-telemetry-prod", "qf-telemetry-prod/egress"];
    // A box for a node: its name, its path (left out for the root, the focus path and the top level,
    // whose names say it), its node count and cost.
    const shown: { path: string; nodes: number; size: number }[] = [];
    // Boxes of what is not shown: "+N hidden under NAME (K children and all below them): N nodes, S"
    // and "K grouped under NAME: …".
    const rest: { under: string; children: number; nodes: number; size: number }[] = [];
    for (const { kind, lines } of boxes) {
      if (kind === "folded") {
        const m = /^\+(\d+) hidden under (.+) \((\d+) child(?:ren)? and all below them\): (.+)$/.exec(
          lines[0],
        );
        expect(m, lines[0]).not.toBeNull();
        if (!m) continue;
        const [nodes, size] = amount(m[4]);
        // The block's label counts the nodes it hides, as its numbers do.
        expect(Number(m[1])).toBe(nodes);
        rest.push({ under: m[2], children: Number(m[3]), nodes, size });
        continue;
      }
      if (kind === "group") {
        const m = /^(\d+) grouped under (.+): (.+)$/.exec(lines[0]);
        expect(m, lines[0]).not.toBeNull();
        if (!m) continue;
        const [nodes, size] = amount(m[3]);
        rest.push({ under: m[2], children: Number(m[1]), nodes, size });
        continue;
      }
      const path =
        lines[0] === "quillfeather-cost-export.csv"
          ? ""
          : !isAmount(lines[1])
            ? lines[1]
            : kind === "other"
              ? lines[0]
              : focusPath.find((p) => p === lines[0] || p.endsWith(`/${lines[0]}`));
      const numbers = lines.find(isAmount);
      expect(path, lines.join(" | ")).toBeDefined();
      expect(numbers, lines.join(" | ")).toBeDefined();
      const [nodes, size] = amount(numbers ?? "");
      expect([path, nodes, size]).toEqual([path, totals.nodes.get(path ?? ""), totals.size.get(path ?? "")]);
      shown.push({ path: path ?? "", nodes, size });
    }
    expect(shown.length).toBeGreaterThan(6);
    expect(rest.length).toBeGreaterThan(3);
    // What is hidden under a shown node is its children, nodes and cost less the shown children's.
    const parentOf = (path: string) => (path.includes("/") ? path.slice(0, path.lastIndexOf("/")) : "");
    for (const parent of shown) {
      const name = parent.path === "" ? "quillfeather-cost-export.csv" : parent.path.split("/").pop();
      const hidden = rest.filter((h) => h.under === name);
      if (hidden.length === 0) continue;
      // A block's name must tell its folded box apart from every other shown block's (the root's path is "").
      if (parent.path !== "")
        expect(shown.filter((b) => b.path.endsWith(`/${name}`) || b.path === name).length).toBe(1);
      const kids = shown.filter((b) => b.path !== "" && parentOf(b.path) === parent.path);
      const children = [...totals.nodes.keys()].filter(
        (q) => q !== "" && q !== parent.path && parentOf(q) === parent.path,
      );
      const sum = (xs: { nodes: number; size: number }[], f: "nodes" | "size") =>
        xs.reduce((s, x) => s + x[f], 0);
      expect([
        parent.path,
        hidden.reduce((s, h) => s + h.children, 0),
        sum(hidden, "nodes"),
        sum(hidden, "size"),
      ]).toEqual([
        parent.path,
        children.length - kids.length,
        parent.nodes - 1 - sum(kids, "nodes"),
        parent.size - sum(kids, "size"),
      ]);
    }
    // And every node of the export is a box or inside one.
    expect(shown.length + rest.reduce((s, h) => s + h.nodes, 0)).toBe(totals.nodes.get(""));
  });

  it("diff of two months: each node's size in the new month, its net change, and the header's totals", async () => {
    const april = readFileSync(fixture, "utf8");
    // May: one service gone, one account new, one service's costs up by 5 a row.
    const may = join(dir, "may.csv");
    const mayRows = april
      .trimEnd()
      .split("\n")
      .filter((row) => !row.startsWith("qf-support,ticket-archive,"))
      .map((row) => {
        if (!row.startsWith("qf-telemetry-prod,egress,")) return row;
        const cells = row.split(",");
        cells[5] = String(Number(cells[5]) + 5);
        return cells.join(",");
      });
    mayRows.push("qf-lab,sandbox,harrow-north,hours,2031-05-01,40");
    writeFileSync(may, `${mayRows.join("\n")}\n`);
    const before = totals;
    const after = totalsOf(readFileSync(may, "utf8"));
    const union = totalsOf(`${april}${mayRows.slice(1).join("\n")}\n`);

    const args = ["diff", fixture, may, ...LEVELS, "--focus", "qf-support", "--budget", "16"];
    const text = await cli(args);
    expect(text.stderr).toBe("");
    const fmt = (n: number | undefined) => (n ?? Number.NaN).toLocaleString("en-US");
    const oldSize = before.size.get("") ?? 0;
    const newSize = after.size.get("") ?? 0;
    const net = newSize - oldSize;
    expect(text.stdout.split("\n")[0]).toContain(
      // The lines count the removed nodes too: the union of both months' rows, the root's count.
      `${fmt(before.nodes.get(""))} -> ${fmt(after.nodes.get(""))} nodes, ${fmt(union.nodes.get(""))} with the ${fmt((union.nodes.get("") ?? 0) - (after.nodes.get("") ?? 0))} removed, cost ${fmt(oldSize)} -> ${fmt(newSize)} (net ${net < 0 ? "-" : "+"}${fmt(Math.abs(net))})`,
    );

    const json = await cli([...args, "--format", "json"]);
    expect(json.stderr).toBe("");
    interface DiffNode {
      path: string;
      nodes: number;
      size: number;
      net: number;
      change: string | null;
      children: DiffNode[];
    }
    const seen: string[] = [];
    const walk = (node: DiffNode) => {
      seen.push(node.path);
      // docs/diff.md: `size` is the size in the new version, `nodes` counts the new version's nodes
      // plus the removed ones, `net` is new minus old.
      const newPart = after.size.get(node.path) ?? 0;
      expect([node.path, node.nodes, node.size, node.net]).toEqual([
        node.path,
        union.nodes.get(node.path),
        newPart,
        newPart - (before.size.get(node.path) ?? 0),
      ]);
      if (!after.size.has(node.path)) expect(node.change).toBe("removed");
      if (!before.size.has(node.path)) expect(node.change).toBe("added");
      for (const child of node.children) walk(child);
    };
    walk(JSON.parse(json.stdout).root);
    expect(seen).toContain("qf-support/ticket-archive");
    expect(seen).toContain("qf-lab");
    expect(seen.length).toBeGreaterThan(8);
  });
});
