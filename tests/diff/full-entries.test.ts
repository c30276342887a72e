import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

/** A node object of `npm ls --all --json`: a full entry (with `overridden`) or a deduped one (without). */
interface Entry {
  version: string;
  overridden?: boolean;
  dependencies?: Record<string, Entry>;
}

const full = (version: string, dependencies?: Record<string, Entry>): Entry => ({
  version,
  overridden: false,
  ...(dependencies ? { dependencies } : {}),
});
const deduped = (version: string): Entry => ({ version });

// The shape npm 11 writes (lib/commands/ls.js; seen on two scratch projects in /tmp, one requiring a
// package that another dependency already pulled in): every entry but the project's holds
// `overridden`, a package's dependencies sit under its first entry only, and each later entry of it is
// `{"version": …}`. Packages invented.
const gauge = () =>
  full("1.4.0", { dial: full("0.3.0"), needle: full("1.0.0", { pin: full("0.1.0") }), scale: full("2.2.0") });
const listing = (dependencies: Record<string, Entry>): string =>
  `${JSON.stringify({ version: "1.0.0", name: "quillfeather-cli", dependencies }, null, 2)}\n`;

/** Before: sextant requires gauge (listed in full there), chart requires it too (deduped). */
const before = listing({
  chart: full("1.1.0", { gauge: deduped("1.4.0") }),
  sextant: full("2.0.0", { gauge: gauge() }),
});
/** A direct dependency on gauge added: npm lists gauge in full at the top, deduped under sextant. */
const direct = listing({
  chart: full("1.1.0", { gauge: deduped("1.4.0") }),
  gauge: gauge(),
  sextant: full("2.0.0", { gauge: deduped("1.4.0") }),
});
/** almanac added, which requires gauge: listed first, it holds gauge's full entry. */
const throughNew = listing({
  almanac: full("0.9.0", { gauge: gauge() }),
  chart: full("1.1.0", { gauge: deduped("1.4.0") }),
  sextant: full("2.0.0", { gauge: deduped("1.4.0") }),
});
/** chart drops gauge and sextant moves to another version of it: a real removal, a real change. */
const changed = listing({
  chart: full("1.1.0"),
  sextant: full("2.0.0", {
    gauge: full("1.5.0", { dial: full("0.3.0"), needle: full("1.0.0", { pin: full("0.1.0") }) }),
  }),
});

/**
 * Reduced from two real listings (npm 11's `npm ls --all --json` of a scratch project before and after
 * one `npm install` of cached packages: from four direct dependencies to three others), by leaving out
 * entries while the diff of the main branch counted them unlike the walk below; names invented. mast's
 * full entry moves from the top to below hull, and rigging, a full entry below mast, has a full entry
 * below keel too, which comes first: paired first, it took cleat, and mast's pairing then paired cleat
 * a second time (a diff of `0 added, 1 removed` whose lines all read the project's name).
 */
const rigging = () => full("6.0.1", { cleat: full("5.0.1") });
const hoisted = listing({ mast: full("7.0.0", { rigging: rigging() }) });
const hoistedWithBow = listing({ bow: full("3.0.1"), mast: full("7.0.0", { rigging: rigging() }) });
const underHull = listing({
  hull: full("5.1.2", {
    keel: full("4.2.3", { rigging: rigging() }),
    beam: deduped("3.1.0"),
    mast: full("7.0.0", { rigging: rigging() }),
  }),
});

/**
 * The independent count: npm's dependency edges (package name@version -> dependency name@version), read
 * by a walk of the JSON written here: each entry's `dependencies`, a deduped entry listing none. Every
 * entry below the top is one edge, so the listing gains as many entries as edges were added.
 */
function edges(text: string): Map<string, number> {
  const counts = new Map<string, number>();
  const walk = (name: string, entry: Entry): void => {
    for (const [child, sub] of Object.entries(entry.dependencies ?? {})) {
      const edge = `${name}@${entry.version} -> ${child}@${sub.version}`;
      counts.set(edge, (counts.get(edge) ?? 0) + 1);
      walk(child, sub);
    }
  };
  const top = JSON.parse(text) as Entry & { name: string };
  walk(top.name, top);
  return counts;
}

/** Edges of `a` that `b` lacks (as a multiset). */
function lacking(a: Map<string, number>, b: Map<string, number>): number {
  let count = 0;
  for (const [edge, n] of a) count += Math.max(0, n - (b.get(edge) ?? 0));
  return count;
}

async function diffJson(oldText: string, newText: string) {
  const result = await cli(["diff", "old.json", "new.json", "--format", "json", "--fail-on-change"], {
    files: { "old.json": oldText, "new.json": newText },
  });
  return { code: result.code, diff: JSON.parse(result.stdout) };
}

describe("pairFullEntries (npm ls --all --json)", () => {
  it.each([
    ["a direct dependency added on an installed package", before, direct],
    ["the same, removed", direct, before],
    ["a package added that requires an installed one", before, throughNew],
    ["the same, removed", throughNew, before],
    ["a direct dependency added while the full entry moves between places", throughNew, direct],
  ])(
    "%s: added and removed count the edges gained and lost, not the dependencies listed elsewhere",
    async (_, oldText, newText) => {
      const { code, diff } = await diffJson(oldText, newText);
      const oldEdges = edges(oldText);
      const newEdges = edges(newText);
      expect(diff.changes.added).toBe(lacking(newEdges, oldEdges));
      expect(diff.changes.removed).toBe(lacking(oldEdges, newEdges));
      // gauge's dependencies (dial, needle, scale: the walk's edges from gauge@1.4.0) moved with its full
      // entry; pin stays under needle.
      const fromGauge = [...newEdges.keys()].filter((e) => e.startsWith("gauge@1.4.0 -> ")).length;
      expect(diff.changes.moved).toBe(fromGauge);
      expect(diff.changes.edited + diff.changes.renamed + diff.changes.resized).toBe(0);
      // Something did change (an edge): --fail-on-change still fires.
      expect(code).toBe(1);
    },
  );

  it.each([
    ["a full entry listed below another one that moves", hoisted, underHull],
    ["the same, back", underHull, hoisted],
    ["the same with a package dropped beside it", hoistedWithBow, underHull],
    ["the same, back", underHull, hoistedWithBow],
  ])("%s: no node is paired twice, and the counts are the edge walk's", async (_, oldText, newText) => {
    const { code, diff } = await diffJson(oldText, newText);
    const oldEdges = edges(oldText);
    const newEdges = edges(newText);
    expect(diff.changes.added).toBe(lacking(newEdges, oldEdges));
    expect(diff.changes.removed).toBe(lacking(oldEdges, newEdges));
    // Each version's entries (one per edge) and the root, as the walk counts them.
    const entries = (e: Map<string, number>) => [...e.values()].reduce((a, b) => a + b, 1);
    expect(diff.totals.old.nodes).toBe(entries(oldEdges));
    expect(diff.totals.new.nodes).toBe(entries(newEdges));
    expect(diff.totals.nodes).toBe(diff.totals.new.nodes + diff.changes.removed);
    expect(code).toBe(1);
  });

  it("pairs a package's full entries at several places with the one that lists as many entries", async () => {
    // gauge 1.4.0 installed at two places in both versions (npm nests a copy where its dependencies need
    // it), under parents that took other names, so neither pairs by path; which copy lists dial in full
    // swaps between the versions. Taken in order, chart's gauge paired with atlas's and pin read as
    // moved too; as many entries below, chart's pairs with beacon's and only the dials move.
    const several = listing({
      chart: full("1.0.0", { gauge: full("1.4.0", { dial: full("0.3.0", { pin: full("0.1.0") }) }) }),
      sextant: full("2.0.0", { gauge: full("1.4.0", { dial: deduped("0.3.0") }) }),
    });
    const swapped = listing({
      atlas: full("1.0.0", { gauge: full("1.4.0", { dial: deduped("0.3.0") }) }),
      beacon: full("2.0.0", { gauge: full("1.4.0", { dial: full("0.3.0", { pin: full("0.1.0") }) }) }),
    });
    const { code, diff } = await diffJson(several, swapped);
    expect(diff.changes.added).toBe(lacking(edges(swapped), edges(several)));
    expect(diff.changes.removed).toBe(lacking(edges(several), edges(swapped)));
    expect(diff.changes.moved).toBe(2);
    expect(code).toBe(1);
    const text = await cli(["diff", "old.json", "new.json"], {
      files: { "old.json": several, "new.json": swapped },
    });
    expect(text.stdout).toContain(": [moved from chart/gauge] dial  2 nodes\n        . pin\n");
  });

  it("leaves a real removal and a version change as they are", async () => {
    const { code, diff } = await diffJson(before, changed);
    // chart's gauge gone (1), gauge 1.4.0 -> 1.5.0 edited, scale gone with it (1): no pairing applies.
    expect(diff.changes).toMatchObject({ added: 0, removed: 2, moved: 0, edited: 1 });
    expect(lacking(edges(before), edges(changed)) - lacking(edges(changed), edges(before))).toBe(
      diff.changes.removed - diff.changes.added,
    );
    expect(code).toBe(1);
  });

  it("pairs nothing in nested JSON that is no npm listing (no deduped entries)", async () => {
    const strip = (text: string) => text.replaceAll('"overridden": false', '"pinned": false');
    const { diff } = await diffJson(strip(before), strip(direct));
    // Matched by path, as docs/diff.md says of any other input: gauge's 4 nodes below sextant removed,
    // 5 added at the top.
    expect(diff.changes).toMatchObject({ added: 5, removed: 4, moved: 0 });
  });

  it("shows the moved dependencies with the entry they left", async () => {
    const result = await cli(["diff", "old.json", "new.json", "--budget", "30"], {
      files: { "old.json": before, "new.json": direct },
    });
    expect(result.stdout).toContain(": [moved from sextant/gauge] dial\n");
    expect(result.stdout.split("\n")[0]).toMatch(/^diff by path: 1 added, 0 removed, 3 moved, /);
  });
});
