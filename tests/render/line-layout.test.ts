import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { changeKinds } from "../../src/diff/changes.js";
import { displayWidth } from "../../src/render/display-width.js";
import {
  FOLD_SIGN,
  type LineParts,
  laidOutLine,
  layoutLine,
  MIN_WIDTH,
} from "../../src/render/line-layout.js";

/** A diff line's parts as diffLineParts writes them, with long tags and folds. */
const arbParts: fc.Arbitrary<LineParts> = fc
  .record({
    level: fc.integer({ min: 0, max: 20_000 }),
    labels: fc.array(
      fc.string({ minLength: 1, maxLength: 40 }).map((s) => s.replace(/[^ -~]/g, "x")),
      {
        minLength: 1,
        maxLength: 4,
      },
    ),
    kind: fc.option(fc.constantFrom(...changeKinds), { nil: null }),
    from: fc.string({ minLength: 0, maxLength: 60 }).map((s) => s.replace(/[^ -~]/g, "y")),
    hidden: fc.option(fc.integer({ min: 1, max: 2_000_000_000 }), { nil: null }),
    changed: fc.integer({ min: 0, max: 2_000_000_000 }),
  })
  .map(({ level, labels, kind, from, hidden, changed }) => {
    const tag = kind === null ? "" : `[${kind} from ${from}, +1,234.5 KiB]`;
    const count = hidden?.toLocaleString("en-US") ?? "";
    return {
      level,
      mark: ".",
      role: "other" as const,
      tag,
      shortTag: kind === null ? "" : `[${kind} from ${from.slice(0, 8)}, +1,234.5 KiB]`,
      tagKind: kind,
      labels,
      numbers: "12,345,678 nodes, 1.2 GiB, net +3.4 MiB",
      compactNumbers: "12.3M nodes, 1.2 GiB, net +3.4 MiB",
      countNumbers: "12,345,678 nodes",
      fold: hidden === null ? "" : `(hidden: ${count} children, 9,999 nodes, 1.0 GiB; 3 added)`,
      foldCounts: hidden === null ? "" : "(hidden: 9,999 nodes, 1.0 GiB; 3 added)",
      compactFold: hidden === null ? "" : `(hidden: ${count} children, 10k nodes, 1.0 GiB; 3 added)`,
      foldShort:
        hidden === null ? "" : `(hidden: ${count} children; ${changed.toLocaleString("en-US")} changed)`,
      foldTiny: hidden === null ? "" : `(${count} hidden, ${changed.toLocaleString("en-US")} changed)`,
    };
  });

describe("layoutLine(parts, { width })", () => {
  it("fits every line in any width from MIN_WIDTH, keeping a fold's sign and the change's kind (property)", () => {
    fc.assert(
      fc.property(arbParts, fc.integer({ min: MIN_WIDTH, max: 70 }), (parts, width) => {
        const line = layoutLine(parts, { width });
        expect(displayWidth(line)).toBeLessThanOrEqual(width);
        // A fold never goes without a sign (issue 12.5): its counts, or at least "(hidden)".
        if (parts.fold !== "") expect(line).toMatch(/\((hidden|hidden: .*|[0-9,]+ hidden.*)\)$/);
        else expect(line).not.toContain("hidden");
        // The change's kind stays on the line: the tag is the only mark of a change.
        if (parts.tagKind !== null) expect(line).toContain(`[${parts.tagKind}`);
      }),
    );
  });

  it("keeps the count to the last: the tag's kind, then the fold's sign, on a deep line of a narrow screen", () => {
    const parts: LineParts = {
      level: 12,
      mark: ".",
      role: "other",
      tag: "[moved from services/ledger/src/events, +2.0 KiB]",
      shortTag: "[moved from serv…ents, +2.0 KiB]",
      tagKind: "moved",
      labels: ["ledger-events"],
      numbers: "41 nodes, 2.0 MiB",
      compactNumbers: "41 nodes, 2.0 MiB",
      countNumbers: "41 nodes",
      fold: "(hidden: 3 children, 40 nodes, 2.0 MiB; 12,345 changed)",
      foldCounts: "(hidden: 40 nodes, 2.0 MiB; 12,345 changed)",
      compactFold: "(hidden: 3 children, 40 nodes, 2.0 MiB; 12,345 changed)",
      foldShort: "(hidden: 40 nodes; 12,345 changed)",
      foldTiny: "(40 hidden, 12,345 changed)",
      foldBare: "(40 hidden)",
    };
    // 50 columns: the tag keeps its kind, the fold its count, the indentation its level in digits;
    // 41 = 1 + 40 hidden can still be checked.
    expect(layoutLine(parts, { width: 50 })).toBe("12 . [moved] ledger-events  41 nodes  (40 hidden)");
    // 40: the name is cut (down to one character and "…") before the count goes.
    expect(layoutLine(parts, { width: 40 })).toBe("12 . [moved] led…  41 nodes  (40 hidden)");
    // 36: "12 . [moved] " (13) + 2 columns of name + "  41 nodes" (10) + "  (40 hidden)" (13) is 38:
    // the fold keeps only its sign, its count the line's less the name; the line's count stays.
    expect(layoutLine(parts, { width: 36 })).toBe(`12 . [moved] le…  41 nodes  ${FOLD_SIGN}`);
    // 30: not even that: a "?" stands where the count was.
    expect(layoutLine(parts, { width: 30 })).toBe(`12 . [moved] led…  ?  ${FOLD_SIGN}`);
    // Below MIN_WIDTH (only a small interactive screen asks): the start is cut, the sign kept.
    expect(layoutLine(parts, { width: 20 })).toBe(`12 . [mov…  ${FOLD_SIGN}`);
  });

  it("drops the fold's children before any number, then cuts names before numbers go", () => {
    const parts: LineParts = {
      level: 0,
      mark: ":",
      role: "path",
      tag: "",
      shortTag: "",
      tagKind: null,
      labels: ["inventory", "warehouses"],
      numbers: "3,257 nodes, 40.6 MiB",
      compactNumbers: "3.3k nodes, 40.6 MiB",
      countNumbers: "3,257 nodes",
      fold: "(hidden: 67 children, 2,648 nodes, 33.2 MiB)",
      foldCounts: "(hidden: 2,648 nodes, 33.2 MiB)",
      compactFold: "(hidden: 67 children, 2.6k nodes, 33.2 MiB)",
      compactFoldCounts: "(hidden: 2.6k nodes, 33.2 MiB)",
      foldShort: "(hidden: 2,648 nodes)",
      foldTiny: "(2,648 hidden)",
    };
    // Whole: 93 columns.
    expect(layoutLine(parts, { width: 93 })).toBe(
      ": inventory / warehouses  3,257 nodes, 40.6 MiB  (hidden: 67 children, 2,648 nodes, 33.2 MiB)",
    );
    // One column less: the children go first; 3,257 = 1 + 608 on the lines below + 2,648 stays checkable.
    expect(layoutLine(parts, { width: 92 })).toBe(
      ": inventory / warehouses  3,257 nodes, 40.6 MiB  (hidden: 2,648 nodes, 33.2 MiB)",
    );
    // Narrower: the chain's names are cut at their ends, its " / " kept (the count holds both names),
    // every number kept exact, down to 4 columns a name.
    expect(layoutLine(parts, { width: 79 })).toBe(
      ": inventory / warehous…  3,257 nodes, 40.6 MiB  (hidden: 2,648 nodes, 33.2 MiB)",
    );
    expect(layoutLine(parts, { width: 70 })).toBe(
      ": inve… / war…  3,257 nodes, 40.6 MiB  (hidden: 2,648 nodes, 33.2 MiB)",
    );
    // Then compact numbers (8 columns a name again), then the fold's size, then the line's size (a
    // text renderer then leaves sizes out of the whole screen, see screenLines).
    expect(layoutLine(parts, { width: 66 })).toBe(
      ": invento… / warehou…  3.3k nodes, 40.6 MiB  (hidden: 2,648 nodes)",
    );
    expect(layoutLine(parts, { width: 60 })).toBe(
      ": inventory / warehouses  3,257 nodes  (hidden: 2,648 nodes)",
    );
    expect(layoutLine(parts, { width: 50 })).toBe(": invento… / warehou…  3,257 nodes  (2,648 hidden)");
    expect(layoutLine(parts, { width: 40 })).toBe(": in… / wa…  3,257 nodes  (2,648 hidden)");
  });

  it("cuts a diff line's name, not its count, where the bare count fits (field test: width 40)", () => {
    // The field test's line, '  : [added] @duckdb  ?  (hidden)' at 40 columns: 11 nodes, 10 hidden,
    // all of them added. "  : [added] " (12) + "  11 nodes" (10) + "  (10 hidden)" (13) leaves 5
    // columns for the name: 11 = 1 + 10 reads off the line.
    const parts: LineParts = {
      level: 1,
      mark: ":",
      role: "path",
      tag: "[added]",
      shortTag: "[added]",
      tagKind: "added",
      labels: ["@duckdb"],
      numbers: "11 nodes",
      compactNumbers: "11 nodes",
      countNumbers: "11 nodes",
      fold: "(hidden: 10 children, 10 nodes; 10 added)",
      foldCounts: "(hidden: 10 nodes; 10 added)",
      compactFold: "(hidden: 10 children, 10 nodes; 10 added)",
      foldShort: "(hidden: 10 nodes; 10 changed)",
      foldTiny: "(10 hidden)",
      foldBare: "(10 hidden)",
    };
    expect(layoutLine(parts, { width: 40 })).toBe("  : [added] @duc…  11 nodes  (10 hidden)");
    expect(layoutLine(parts, { width: 42 })).toBe("  : [added] @duckdb  11 nodes  (10 hidden)");
    expect(layoutLine(parts, { width: 80 })).toBe(
      "  : [added] @duckdb  11 nodes  (hidden: 10 children, 10 nodes; 10 added)",
    );
    // 38 columns: the name keeps two characters and "…"; at 37 the fold keeps only its sign, its
    // count the line's less the name (10 = 11 - 1), before the name goes under two characters: the
    // line's count, which the line above adds up, stays.
    expect(layoutLine(parts, { width: 38 })).toBe("  : [added] @d…  11 nodes  (10 hidden)");
    expect(layoutLine(parts, { width: 37 })).toBe("  : [added] @duc…  11 nodes  (hidden)");
    expect(layoutLine(parts, { width: 35 })).toBe("  : [added] @d…  11 nodes  (hidden)");
    expect(layoutLine(parts, { width: 33 })).toBe("  : [added] …  11 nodes  (hidden)");
    expect(layoutLine(parts, { width: 32 })).toBe("  : [added] @duckdb  ?  (hidden)");
  });

  it("leaves a count out, not the name, where the fold says it: 1 node + what it hides (field test: 32 columns)", () => {
    // Field test: `find /usr/share` at 32 columns printed `  . ma…  666 nodes  (665 hidden)`: the
    // line shows nothing below it, so 666 = 1 + 665 and the count says nothing the fold does not.
    const parts: LineParts = {
      level: 1,
      mark: ".",
      role: "other",
      tag: "",
      shortTag: "",
      tagKind: null,
      labels: ["maven-repo"],
      numbers: "666 nodes",
      compactNumbers: "666 nodes",
      countNumbers: "666 nodes",
      fold: "(hidden: 12 children, 665 nodes)",
      foldCounts: "(hidden: 665 nodes)",
      compactFold: "(hidden: 12 children, 665 nodes)",
      foldShort: "(hidden: 665 nodes)",
      foldTiny: "(665 hidden)",
      countInFold: true,
    };
    // Where the whole name fits beside it, the count stays.
    expect(layoutLine(parts, { width: 40 })).toBe("  . maven-repo  666 nodes  (665 hidden)");
    const narrow = laidOutLine(parts, { width: 32 });
    expect(narrow.text).toBe("  . maven-repo  (665 hidden)");
    expect(narrow).toMatchObject({ countInFold: true, countCut: false, nameCut: false });
    expect(layoutLine(parts, { width: MIN_WIDTH })).toBe("  . maven-repo  (665 hidden)");
    // A line with lines below it (no countInFold) keeps its count: the fold is not all below it.
    const { countInFold: _, ...above } = parts;
    expect(layoutLine(above, { width: 32 })).toBe("  . ma…  666 nodes  (665 hidden)");
    expect(laidOutLine(above, { width: 32 }).countInFold).toBe(false);
  });

  it("cuts a pseudonym's shared anon- before its hex digits (--pseudonymize)", () => {
    // Field test: the org chart under --pseudonymize at 60 columns printed `anon-4…`, `anon-5…`,
    // `anon…`: every pseudonym starts with anon-, so the cut kept what tells none of them apart.
    const parts: LineParts = {
      level: 1,
      mark: ":",
      role: "path",
      tag: "",
      shortTag: "",
      tagKind: null,
      labels: ["anon-4193762583c0"],
      numbers: "618 nodes, 85,125,650",
      compactNumbers: "618 nodes, 85.1M",
      countNumbers: "618 nodes",
      fold: "(hidden: 4 children, 427 nodes, 58,304,800)",
      foldCounts: "(hidden: 427 nodes, 58,304,800)",
      compactFold: "(hidden: 4 children, 427 nodes, 58.3M)",
      foldShort: "(hidden: 427 nodes)",
      foldTiny: "(427 hidden)",
      foldSized: "(427 hidden, 58,304,800)",
    };
    expect(layoutLine(parts, { width: 60 })).toBe(
      "  : …41937…  618 nodes, 85,125,650  (427 hidden, 58,304,800)",
    );
    // A chain's names alike; a name that only looks like one (no 12 hex digits) is cut at its end.
    const chain = { ...parts, labels: ["anon-4193762583c0", "anon-5012ffbb1568"] };
    expect(layoutLine(chain, { width: 60 })).toBe(
      "  : …419376258… / …5012ffbb…  618 nodes  (hidden: 427 nodes)",
    );
    const plain = { ...parts, labels: ["anon-harbour-ledger"] };
    expect(layoutLine(plain, { width: 60 })).toBe(
      "  : anon-h…  618 nodes, 85,125,650  (427 hidden, 58,304,800)",
    );
  });

  it("says a tag's cut old value as a cut, even where the name stays whole", () => {
    // Field test: `[edited version 4.10.2 -> 4.10…ext] fast-check` at 80 columns, under a key that
    // said nothing of the `…`.
    const parts: LineParts = {
      level: 1,
      mark: ":",
      role: "path",
      tag: "[edited version 4.10.2 -> 4.10.2-next]",
      shortTag: "[edited 1 field]",
      tagWithin: (room) => (room >= 35 ? { tag: "[edited version 4.10.2 -> 4.10…ext]", cut: true } : null),
      tagKind: "edited",
      labels: ["fast-check"],
      numbers: "2 nodes",
      compactNumbers: "2 nodes",
      countNumbers: "2 nodes",
      fold: "(hidden: 1 child, 1 node; none changed)",
      foldCounts: "(hidden: 1 node; none changed)",
      compactFold: "(hidden: 1 child, 1 node; none changed)",
      foldShort: "(hidden: 1 node; none changed)",
      foldTiny: "(1 hidden, 0 changed)",
      foldBare: "(1 hidden)",
    };
    const line = laidOutLine(parts, { width: 84 });
    expect(line.text).toBe(
      "  : [edited version 4.10.2 -> 4.10…ext] fast-check  2 nodes  (1 hidden, 0 changed)",
    );
    expect(line.nameCut).toBe(true);
    expect(laidOutLine(parts, { width: 100 }).nameCut).toBe(false);
    // Narrower, the tag says how many fields, no cut: the key has no `…` to explain.
    const brief = laidOutLine(parts, { width: 70 });
    expect(brief.text).toBe("  : [edited 1 field] fast-check  2 nodes  (1 hidden, 0 changed)");
    expect(brief.nameCut).toBe(false);
  });

  it("cuts wide names by their columns, never half a character, the count kept (UAX #11)", () => {
    // Source: Unicode Standard Annex #11 (East Asian Width), via string-width: CJK ideographs are class
    // W, two columns each; fullwidth Latin letters are class F, two columns; halfwidth katakana are
    // class H, one column.
    const parts = (labels: string[]): LineParts => ({
      level: 1,
      mark: ".",
      role: "other",
      tag: "",
      shortTag: "",
      tagKind: null,
      labels,
      numbers: "3,257 nodes, 40.6 MiB",
      compactNumbers: "3.3k nodes, 40.6 MiB",
      countNumbers: "3,257 nodes",
      fold: "(hidden: 67 children, 2,648 nodes, 33.2 MiB)",
      foldCounts: "(hidden: 2,648 nodes, 33.2 MiB)",
      compactFold: "(hidden: 67 children, 2.6k nodes, 33.2 MiB)",
      compactFoldCounts: "(hidden: 2.6k nodes, 33.2 MiB)",
      foldShort: "(hidden: 2,648 nodes)",
      foldTiny: "(2,648 hidden)",
    });
    // 倉庫管理部門 is 6 ideographs, 12 columns.
    const wide = parts(["倉庫管理部門"]);
    expect(layoutLine(wide, { width: 80 })).toBe(
      "  . 倉庫管理部門  3,257 nodes, 40.6 MiB  (hidden: 2,648 nodes, 33.2 MiB)",
    );
    // 66 columns: 4 + 12 + 23 + 33 = 72 is too wide; exact numbers leave 6 columns, above the 4 a
    // name keeps before numbers turn compact: two ideographs (4) and "…", a third would need 7.
    expect(layoutLine(wide, { width: 66 })).toBe(
      "  . 倉庫…  3,257 nodes, 40.6 MiB  (hidden: 2,648 nodes, 33.2 MiB)",
    );
    expect(layoutLine(wide, { width: 40 })).toBe("  . 倉庫管…  3,257 nodes  (2,648 hidden)");
    // Fullwidth (F) and halfwidth (H) in one chain: the joins stay, each name cut to the same width.
    const chain = parts(["ＡＢＣＤ", "ｶﾀｶﾅｶﾀｶﾅ"]);
    // 50: 11 columns for the names, 4 for the joins and 7 for the second... the first name "ＡＢＣ…"
    // (7, its fourth ideograph would need 9) and "ｶﾀｶﾅｶﾀ…" (7).
    expect(layoutLine(chain, { width: 50 })).toBe("  . ＡＢＣ… / ｶﾀｶﾅｶﾀ…  3,257 nodes  (2,648 hidden)");
    // 40: 6 columns for two names with the fold's count, under two characters each: the fold keeps
    // only its sign (2,648 = 3,257 less the 2 names) and the names 5 columns each: "ＡＢ…", "ｶﾀｶﾅ…".
    expect(layoutLine(chain, { width: 40 })).toBe("  . ＡＢ… / ｶﾀｶﾅ…  3,257 nodes  (hidden)");
    for (const width of [40, 50, 60, 66, 80, 200])
      for (const p of [wide, chain]) {
        const line = layoutLine(p, { width });
        expect(displayWidth(line)).toBeLessThanOrEqual(width);
        // The count stays at every width here (a count gives way only when no cut name lets it fit;
        // at 30 columns "  . " + "  3.3k nodes" + "  (2,648 hidden)" alone is 32).
        expect(line).toMatch(/ {2}3[.,][0-9k,]+ nodes/);
      }
  });

  it("lets a count go only when even a one-character name would not make room for it (property)", () => {
    const unit = fc.constantFrom("a", "-", "名", "Ａ", "ｶ", "e\u0301");
    const wideParts = fc
      .tuple(
        arbParts,
        fc.array(fc.array(unit, { minLength: 1, maxLength: 20 }), { minLength: 1, maxLength: 3 }),
      )
      .map(([p, names]) => ({ ...p, labels: names.map((n) => n.join("")) }));
    fc.assert(
      fc.property(fc.oneof(arbParts, wideParts), fc.integer({ min: MIN_WIDTH, max: 90 }), (parts, width) => {
        const line = layoutLine(parts, { width });
        expect(displayWidth(line)).toBeLessThanOrEqual(width);
        const kept = [parts.numbers, parts.compactNumbers, parts.countNumbers];
        if (kept.some((numbers) => line.includes(`  ${numbers}`))) return;
        // The narrowest line that keeps the count: level digits, the tag's kind, every name at one
        // column ("…" alone; a chain's joins kept), the fold's bare count.
        const kind = parts.tagKind ? `[${parts.tagKind}] ` : "";
        const names = parts.labels.map((l) => Math.min(displayWidth(l), 1)).reduce((a, b) => a + b);
        const least = Math.min(2 * parts.level, `${parts.level} `.length);
        const joins = 3 * (parts.labels.length - 1);
        const fold = parts.fold ? 2 + displayWidth(parts.foldBare ?? parts.foldTiny) : 0;
        const needed =
          least + 2 + displayWidth(kind) + joins + names + 2 + displayWidth(parts.countNumbers) + fold;
        expect(needed, line).toBeGreaterThan(width);
      }),
    );
  });
});

describe("layoutLine(parts, { width }) for a long chain of only children", () => {
  // Field defect: at 60 columns a chain of 4-digit names was cut in its middle with its count gone,
  // `. 1037 / 1074 / … /…06 / 2443 / …  ?`, so nothing on the line could be checked.
  const chain = (n: number, name = (k: number) => String(1000 + ((k * 7919) % 9000))): LineParts => ({
    level: 0,
    mark: ".",
    role: "other",
    tag: "",
    shortTag: "",
    tagKind: null,
    labels: Array.from({ length: n }, (_, k) => name(k)),
    numbers: `${n + 5} nodes`,
    compactNumbers: `${n + 5} nodes`,
    countNumbers: `${n + 5} nodes`,
    fold: "",
    foldCounts: "",
    compactFold: "",
    foldShort: "",
    foldTiny: "",
  });
  /** The names a chain line stands for: those printed, and the k of a `(k more)`. */
  const namesOn = (line: string): number => {
    const names = line
      .replace(/ {2}.*$/, "")
      .slice(2)
      .split(" / ");
    const more = names.map((n) => /^\(([\d,]+) more\)$/.exec(n)).find((m) => m !== null);
    return names.length - (more ? 1 - Number(more[1].replace(/,/g, "")) : 0);
  };

  it("keeps the count, the first and last names and how many it leaves out between them", () => {
    const line = layoutLine(chain(120), { width: 60 });
    expect(displayWidth(line)).toBeLessThanOrEqual(60);
    expect(line).toMatch(/^\. 1000 \/ .* \/ \(\d+ more\) \/ .* \/ \d{4} {2}125 nodes$/);
    expect(namesOn(line)).toBe(120);
  });

  it("prints a count only beside names that can be counted to it, at any width (property)", () => {
    const names = fc.constantFrom(
      (k: number) => String(k),
      (k: number) => `bay-${k}-annex`,
      (k: number) => `倉庫${k}`,
    );
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 400 }),
        names,
        fc.integer({ min: MIN_WIDTH, max: 120 }),
        (n, name, width) => {
          const line = layoutLine(chain(n, name), { width });
          expect(displayWidth(line)).toBeLessThanOrEqual(width);
          if (!line.endsWith(`  ${n + 5} nodes`)) return;
          expect(namesOn(line), line).toBe(n);
        },
      ),
    );
    // The count stays wherever the first and last names fit at one column around the marker: at 30
    // columns `. … / (48 more) / …  55 nodes` is 30 (with 398 more it would be 32).
    for (const n of [3, 50]) expect(layoutLine(chain(n), { width: MIN_WIDTH })).toContain(`  ${n + 5} nodes`);
  });
});
