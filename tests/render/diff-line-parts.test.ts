import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { DiffViewNode } from "../../src/diff/diff-view.js";
import { tagParts } from "../../src/render/diff-line-parts.js";
import { displayWidth } from "../../src/render/display-width.js";
import { type LineParts, laidOutLine, layoutLine } from "../../src/render/line-layout.js";
import { cli } from "../helpers/cli.js";

/** An edited node as the diff's view holds it: what `changeTag` reads. */
const edited = (edits: { field: string; old: string; new: string }[]) =>
  ({
    change: "edited",
    delta: 0,
    movedFrom: null,
    renamedFrom: null,
    edits,
  }) as unknown as DiffViewNode;

/** The parts of a line of one edited node with no fold, its tag's forms from `tagParts`. */
function editedLine(node: DiffViewNode, label: string): LineParts {
  return {
    level: 2,
    mark: ":",
    role: "path",
    ...tagParts(node, { units: "bytes", sizes: false }),
    tagKind: "edited",
    labels: [label],
    numbers: "",
    compactNumbers: "",
    countNumbers: "",
    fold: "",
    foldCounts: "",
    compactFold: "",
    foldShort: "",
    foldTiny: "",
  };
}

// Values from ASCII, CJK ideographs and emoji: UAX #11 (East Asian Width) gives the ideographs class
// W, two columns; string-width counts an emoji presentation sequence two columns too.
const char = fc.constantFrom(..."abcdefgh-:./0123456789", "東", "京", "倉", "庫", "📦", "🚚");
const value = fc.array(char, { minLength: 0, maxLength: 70 }).map((cs) => cs.join(""));

describe("tagParts(node) laid out by layoutLine(parts, { width })", () => {
  it("fits every width, cutting a value only when the whole line would not fit, and no more than it needs (property)", () => {
    fc.assert(
      fc.property(
        value,
        value,
        fc.array(char, { minLength: 1, maxLength: 30 }).map((cs) => cs.join("")),
        fc.integer({ min: 40, max: 200 }),
        (old, now, label, width) => {
          fc.pre(old !== now);
          const parts = editedLine(edited([{ field: "image", old, new: now }]), label);
          const full = layoutLine(parts);
          const laid = laidOutLine(parts, { width });
          expect(displayWidth(laid.text)).toBeLessThanOrEqual(width);
          const shown = (v: string) => (v === "" ? "(none)" : v);
          const whole = `image ${shown(old)} -> ${shown(now)}]`;
          if (displayWidth(full) <= width) expect(laid.text).toBe(full);
          // Cut values keep apart: the part where they differ stays on both sides of the arrow.
          const edit = /image (.*) -> (.*)\] /.exec(laid.text);
          if (edit !== null) expect(edit[1]).not.toBe(edit[2]);
          // A tag cut wider than its narrowest form, the name whole, leaves no room unused but what
          // a two-column character or the ellipsis's placing can (a few columns).
          const cut = !laid.text.includes(whole) && !laid.text.includes(parts.shortTag);
          if (edit !== null && cut && laid.text.endsWith(` ${label}`))
            expect(displayWidth(laid.text)).toBeGreaterThan(width - 6);
        },
      ),
      { numRuns: 400 },
    );
  });
});

describe("espalier diff: edited values on a line with room", () => {
  it("cuts a long image to the columns the line has, keeping where it changed (field test: --width 90)", async () => {
    // Field test: `image regi…0.2 -> regi…1.2` at --width 90, where about 20 columns a value fit.
    // An invented freight company's services, each with a version and an image.
    const services = (minor: number) =>
      [
        "name: harrowgate-platform",
        "children:",
        "  - name: routing",
        "    children:",
        "      - name: routing-worker-2",
        `        version: "2.${minor}.2"`,
        `        image: "registry.harrowgate.example/platform/routing/routing-worker-2:2.${minor}.2"`,
        "      - name: routing-worker-3",
        '        version: "2.0.3"',
        '        image: "registry.harrowgate.example/platform/routing/routing-worker-3:2.0.3"',
        "",
      ].join("\n");
    const result = await cli(["diff", "old.yaml", "new.yaml", "--width", "90"], {
      files: { "old.yaml": services(0), "new.yaml": services(1) },
    });
    expect(result.code).toBe(0);
    const line = result.stdout.split("\n").find((l) => l.includes("[edited"))!;
    expect(displayWidth(line)).toBeLessThanOrEqual(90);
    expect(displayWidth(line)).toBeGreaterThan(85);
    const [, old, now] = /image (\S+) -> (\S+)\] routing-worker-2$/.exec(line)!;
    expect(old).toMatch(/2\.0\.2$/);
    expect(now).toMatch(/2\.1\.2$/);
    expect(displayWidth(old)).toBeGreaterThanOrEqual(12);
    expect(line).toContain("version 2.0.2 -> 2.1.2");
  });

  it("cuts the values further, each keeping where it changed, before the tag says only its kind (field test: --width 60)", async () => {
    // Field test: `[edited] tern` at --width 60, where each value cut to a few columns fit. An invented
    // shipping company's two services, each with an image and a replica count.
    const services = (tag: string, replicas: number) =>
      [
        "services:",
        "  - name: ledger",
        "    image: registry.example/ledger:1.4",
        "    replicas: 2",
        "  - name: tern",
        `    image: registry.example/tern:${tag}`,
        `    replicas: ${replicas}`,
        "",
      ].join("\n");
    const result = await cli(["diff", "old.yaml", "new.yaml", "--width", "60"], {
      files: { "old.yaml": services("2.0", 1), "new.yaml": services("2.1", 3) },
    });
    expect(result.code).toBe(0);
    const line = result.stdout.split("\n").find((l) => l.includes("[edited"))!;
    expect(displayWidth(line)).toBeLessThanOrEqual(60);
    const [, old, now] = /\[edited image (\S+) -> (\S+), replicas 1 -> 3\] tern$/.exec(line)!;
    expect(old).toMatch(/….*0$/);
    expect(now).toMatch(/….*1$/);
  });
});
