import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { DiffViewNode } from "../../src/diff/diff-view.js";
import { tagParts } from "../../src/render/diff-line-parts.js";
import { displayWidth, ELLIPSIS } from "../../src/render/display-width.js";
import { VALUE_CONTEXT } from "../../src/render/edit-values.js";
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

/** Code points two texts share at their start, and at their end after that. */
function shared(a: string[], b: string[]): [number, number] {
  const shorter = Math.min(a.length, b.length);
  let prefix = 0;
  while (prefix < shorter && a[prefix] === b[prefix]) prefix++;
  let suffix = 0;
  while (suffix < shorter - prefix && a[a.length - 1 - suffix] === b[b.length - 1 - suffix]) suffix++;
  return [prefix, suffix];
}

/**
 * Whether `shown`, a value `whole` as a tag shows it beside the other value `other`, is whole or keeps
 * where it changed with at least VALUE_CONTEXT columns of text on each side where the value has them
 * (one less where a two-column character (UAX #11) did not fit), or is cut around a changed part too
 * long for that, keeping at least 8 columns (7 where a two-column character did not fit).
 */
function readable(shown: string, whole: string, other: string): boolean {
  if (shown === whole) return true;
  const points = Array.from(whole);
  const [prefix, suffix] = shared(points, Array.from(other));
  const end = Math.max(prefix, points.length - suffix);
  const changed = displayWidth(points.slice(prefix, end).join(""));
  if (shown.slice(1, -1).includes(ELLIPSIS)) return changed > 8 && displayWidth(shown) >= 7;
  const inner = Array.from(shown.replace(/^…/, "").replace(/…$/, ""));
  const from = shown.startsWith(ELLIPSIS)
    ? shown.endsWith(ELLIPSIS)
      ? -1
      : points.length - inner.length
    : 0;
  const starts = from >= 0 ? [from] : points.map((_, k) => k);
  const width = (a: number, b: number) => displayWidth(points.slice(a, b).join(""));
  return starts.some((start) => {
    const stop = start + inner.length;
    if (points.slice(start, stop).join("") !== inner.join("")) return false;
    if (changed > 8) return displayWidth(shown) >= 7;
    const before = Math.min(VALUE_CONTEXT, width(0, prefix));
    const after = Math.min(VALUE_CONTEXT, width(end, points.length));
    return (
      start <= prefix && stop >= end && width(start, prefix) >= before - 1 && width(end, stop) >= after - 1
    );
  });
}

describe("tagParts(node) of several edits laid out by laidOutLine(parts, { width })", () => {
  const fieldNames = ["image", "labels", "ports"];
  it("fits every width; cuts the name only where it cannot stand whole beside the kind; shows each value readable or not at all (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(value, value), { minLength: 1, maxLength: 3 }),
        fc.array(char, { minLength: 1, maxLength: 40 }).map((cs) => cs.join("")),
        fc.integer({ min: 40, max: 200 }),
        (pairs, label, width) => {
          fc.pre(pairs.every(([a, b]) => a !== b));
          const edits = pairs.map(([old, now], k) => ({ field: fieldNames[k], old, new: now }));
          const parts = editedLine(edited(edits), label);
          const laid = laidOutLine(parts, { width });
          expect(displayWidth(laid.text)).toBeLessThanOrEqual(width);
          // The name whole beside the kind alone: "    : [edited] NAME".
          if (displayWidth(`    : [edited] ${label}`) <= width)
            expect(laid.text.endsWith(`] ${label}`)).toBe(true);
          const tag = /^ {4}: \[edited(.*)\] /.exec(laid.text);
          expect(tag).not.toBeNull();
          const said = tag![1];
          if (said === ` ${pairs.length} field${pairs.length === 1 ? "" : "s"}` || said === "") return;
          // Fields said: the first ones, each `FIELD OLD -> NEW`, then how many more.
          const more = /, \+(\d+) more fields?$/.exec(said);
          const listed = more === null ? said : said.slice(0, more.index);
          const fields = listed
            .slice(1)
            .split(/, (?=image |labels |ports )/)
            .map((f) => /^(\w+) (.*) -> (.*)$/.exec(f)!);
          expect(fields.length + Number(more?.[1] ?? 0)).toBe(pairs.length);
          const shown = (v: string) => (v === "" ? "(none)" : v);
          fields.forEach((f, k) => {
            expect(f[1]).toBe(fieldNames[k]);
            const [old, now] = pairs[k].map(shown);
            expect(readable(f[2], old, now), `${f[2]} of ${old}`).toBe(true);
            expect(readable(f[3], now, old), `${f[3]} of ${now}`).toBe(true);
          });
        },
      ),
      { numRuns: 2000 },
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

  it("keeps the name whole, saying fewer fields before values are cut unreadably (field test: --width 90)", async () => {
    // Field test: `[edited image reg….4 -> reg….5, labels … bac… -> … fro…, ports [… 84… -> [… 94…]
    // ledg…` at --width 90, every value cut to 3 columns and the name cut; cd18f12's build printed
    // `[edited] ledger-api`. An invented harbour company's two services.
    const services = (tag: string, tier: string, port: number) =>
      [
        "name: harbour-ops",
        "children:",
        "  - name: ledger-api",
        `    image: registry.example/ledger:${tag}`,
        "    replicas: 3",
        `    labels: {tier: ${tier}}`,
        `    ports: [8080, ${port}]`,
        "  - name: invoice-ui",
        "    image: registry.example/invoice:0.9",
        "",
      ].join("\n");
    const files = { "old.yaml": services("1.4", "back", 8443), "new.yaml": services("1.5", "front", 9443) };
    const at = async (width: number) => {
      const result = await cli(["diff", "old.yaml", "new.yaml", "--width", `${width}`, "--bare"], { files });
      expect(result.code).toBe(0);
      return result.stdout.split("\n").find((l) => l.includes("[edited"))!;
    };
    const line90 = await at(90);
    expect(displayWidth(line90)).toBeLessThanOrEqual(90);
    expect(line90).toMatch(
      /^ {2}: \[edited image …\S*ledger:1\.4 -> …\S*ledger:1\.5, \+2 more fields\] ledger-api$/,
    );
    expect(await at(120)).toMatch(/labels \{tier: back\} -> \{tier: front\}, \+1 more field\] ledger-api$/);
    expect(await at(60)).toBe("  : [edited 3 fields] ledger-api");
    // The key says what the `…` in a value is: a cut, not a name's.
    const keyed = await cli(["diff", "old.yaml", "new.yaml", "--width", "90"], { files });
    expect(keyed.stdout.split("\n").find((l) => l.startsWith("key:"))).toContain("'…' cut text");
  });

  it("says fewer fields, then how many, before the name is cut (field test: --width 60)", async () => {
    // An invented shipping company's two services, each with an image and a replica count.
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
    const files = { "old.yaml": services("2.0", 1), "new.yaml": services("2.1", 3) };
    const at = async (width: number) => {
      const result = await cli(["diff", "old.yaml", "new.yaml", "--width", `${width}`, "--bare"], { files });
      return result.stdout.split("\n").find((l) => l.includes("[edited"))!;
    };
    expect(await at(70)).toBe("  : [edited image …le/tern:2.0 -> …le/tern:2.1, replicas 1 -> 3] tern");
    expect(await at(60)).toBe("  : [edited image …ern:2.0 -> …ern:2.1, +1 more field] tern");
    expect(await at(50)).toBe("  : [edited 2 fields] tern");
  });
});
