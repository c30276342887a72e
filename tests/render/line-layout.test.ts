import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { changeKinds } from "../../src/diff/changes.js";
import { displayWidth } from "../../src/render/display-width.js";
import { FOLD_SIGN, type LineParts, layoutLine, MIN_WIDTH } from "../../src/render/line-layout.js";

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
      countNumbers: "12.3M nodes",
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

  it("keeps only the tag's kind, then only the fold's sign, on a deep line of a narrow screen", () => {
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
      foldShort: "(hidden: 3 children; 12,345 changed)",
      foldTiny: "(3 hidden, 12,345 changed)",
    };
    // 44 columns: "12 " + ". " + "[moved] " (13) + "  ?" (3) + "  (3 hidden, 12,345 changed)" (28) leaves
    // no room for 8 columns of name: the fold keeps only its sign, the name stays whole, and a "?" stands
    // where the numbers were.
    expect(layoutLine(parts, { width: 44 })).toBe(`12 . [moved] ledger-events  ?  ${FOLD_SIGN}`);
    // 30 columns: 13 + "  ?" (3) + "  (hidden)" (10) leaves 4 columns, and the name is cut at its end.
    expect(layoutLine(parts, { width: 30 })).toBe(`12 . [moved] led…  ?  ${FOLD_SIGN}`);
    expect(layoutLine(parts, { width: 60 })).toBe(
      "12 . [moved] ledger-events  ?  (3 hidden, 12,345 changed)",
    );
    // Below MIN_WIDTH (only a small interactive screen asks): the start is cut, the sign kept.
    expect(layoutLine(parts, { width: 20 })).toBe(`12 . [mov…  ${FOLD_SIGN}`);
  });

  it("drops the fold's children before any number, so the line's count can still be checked", () => {
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
      countNumbers: "3.3k nodes",
      fold: "(hidden: 67 children, 2,648 nodes, 33.2 MiB)",
      foldCounts: "(hidden: 2,648 nodes, 33.2 MiB)",
      compactFold: "(hidden: 67 children, 2.6k nodes, 33.2 MiB)",
      foldShort: "(hidden: 67 children)",
      foldTiny: "(67 hidden)",
    };
    // Whole: 93 columns.
    expect(layoutLine(parts, { width: 93 })).toBe(
      ": inventory / warehouses  3,257 nodes, 40.6 MiB  (hidden: 67 children, 2,648 nodes, 33.2 MiB)",
    );
    // One column less: the children go first; 3,257 = 1 + 608 on the lines below + 2,648 stays checkable.
    expect(layoutLine(parts, { width: 92 })).toBe(
      ": inventory / warehouses  3,257 nodes, 40.6 MiB  (hidden: 2,648 nodes, 33.2 MiB)",
    );
    expect(layoutLine(parts, { width: 80 })).toBe(
      ": inventory / warehouses  3,257 nodes, 40.6 MiB  (hidden: 2,648 nodes, 33.2 MiB)",
    );
    // Narrower still (the compact fold, 91 columns, is no shorter here): only the children.
    expect(layoutLine(parts, { width: 79 })).toBe(
      ": inventory / warehouses  3.3k nodes, 40.6 MiB  (hidden: 67 children)",
    );
  });
});
