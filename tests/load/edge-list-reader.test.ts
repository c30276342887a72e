import { Buffer } from "node:buffer";
import { Readable } from "node:stream";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { firstBelow, idHash, sameBytes } from "../../src/load/id-hash.js";
import { edgeListStream } from "../../src/load/stream/edge-list-stream.js";
import type { GraphNodes } from "../../src/model/graph-nodes.js";
import type { NamePool } from "../../src/model/names.js";

const view = (bytes: Uint8Array) => new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);

describe("idHash (MurmurHash3, x86 32-bit)", () => {
  it("gives the published values of the reference implementation", () => {
    // MurmurHash3_x86_32 test values as SMHasher's implementation gives them (from memory: the values
    // widely quoted to check ports; each one passing is evidence of the words, tail and finish).
    const cases: [string, number, number][] = [
      ["", 0, 0],
      ["", 1, 0x514e28b7],
      ["", 0xffffffff, 0x81f16f39],
      ["\0\0\0\0", 0, 0x2362f9de],
      ["aaaa", 0x9747b28c, 0x5a97808a],
      ["abc", 0, 0xb3dd93fa],
      ["hello", 0, 0x248bfa47],
      ["Hello, world!", 0x9747b28c, 0x24884cba],
      ["The quick brown fox jumps over the lazy dog", 0, 0x2e4ff723],
    ];
    for (const [text, seed, expected] of cases) {
      const bytes = Buffer.from(text, "latin1");
      expect(idHash(view(bytes), 0, bytes.length, seed) >>> 0).toBe(expected);
    }
  });

  it("hashes the same bytes alike wherever they lie in a buffer (no byte outside the range is read)", () => {
    fc.assert(
      fc.property(
        fc.uint8Array({ maxLength: 40 }),
        fc.nat(7),
        fc.uint8Array({ maxLength: 7 }),
        (id, before, after) => {
          const alone = Buffer.from(id);
          const inside = Buffer.concat([Buffer.alloc(before, 0x61), alone, Buffer.from(after)]);
          expect(idHash(view(inside), before, before + id.length, 7)).toBe(
            idHash(view(alone), 0, id.length, 7),
          );
        },
      ),
    );
  });
});

describe("firstBelow and sameBytes, four bytes at a time", () => {
  it("find what a byte-by-byte scan finds", () => {
    // Common practice, no source: the word-at-a-time answer must be the plain loop's, for every limit
    // the reader uses and bytes on both sides of it (control bytes, ASCII, UTF-8 lead and trail bytes).
    fc.assert(
      fc.property(
        fc.uint8Array({ maxLength: 24 }),
        fc.nat(24),
        fc.nat(24),
        fc.constantFrom(0x21, 0x0e, 0x80, 1),
        (bytes, a, b, limit) => {
          const s = Math.min(a, b, bytes.length);
          const e = Math.min(Math.max(a, b), bytes.length);
          let expected = e;
          for (let k = s; k < e; k++)
            if (bytes[k] < limit) {
              expected = k;
              break;
            }
          expect(firstBelow(view(bytes), s, e, limit)).toBe(expected);
        },
      ),
    );
  });

  it("compare as a byte loop does", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 20 }), fc.nat(19), fc.nat(255), (bytes, at, byte) => {
        const other = Buffer.from(bytes);
        if (at < other.length) other[at] = byte;
        const equal = Buffer.compare(Buffer.from(bytes), other) === 0;
        const padded = Buffer.concat([Buffer.from([1, 2, 3]), other]);
        expect(sameBytes(view(bytes), 0, view(padded), 3, bytes.length)).toBe(equal);
      }),
    );
  });
});

/** What the reader should make of `lines` (common practice, no source: the format docs/input.md gives). */
function expected(lines: string[], tabs: boolean) {
  const ids: string[] = [];
  const origin: number[] = [];
  const number = new Map<string, number>();
  const node = (id: string, line: number) => {
    let i = number.get(id);
    if (i === undefined) {
      i = ids.length;
      number.set(id, i);
      ids.push(id);
      origin.push(line);
    }
    return i;
  };
  const edges: [number, number, number][] = [];
  lines.forEach((raw, at) => {
    const line = raw.endsWith("\r") ? raw.slice(0, -1) : raw;
    const fields = tabs ? line.split("\t") : line.split(/[ \t]+/).filter((f) => f !== "");
    if (fields.length === 0 || (tabs && line.trim() === "")) return;
    const p = node(fields[0], at + 1);
    if (fields.length === 2) edges.push([p, node(fields[1], at + 1), at + 1]);
  });
  return { ids, origin, edges };
}

function read(nodes: GraphNodes) {
  const pool = nodes.ids as NamePool;
  const ids = Array.from({ length: nodes.origin.length }, (_, i) => pool.get(i));
  const edges: [number, number, number][] = [];
  for (let k = 0; k < nodes.edgeCount; k++)
    edges.push([nodes.edgeFrom[k], nodes.edgeTo[k], nodes.edgeOrigin[k]]);
  return { ids, origin: [...nodes.origin], edges };
}

describe("EdgeListReader: every id read as its bytes, whichever way its line is read", () => {
  // Ids of every length around a word's four bytes, with UTF-8, DEL and (with tabs) inner spaces; a
  // pool small enough that ids repeat, parents run in groups and children are found again.
  const idChars = ["a", "b", "Z", "9", "-", "é", "漢", "\x7f", "~"];
  const arbId = fc
    .array(fc.constantFrom(...idChars), { minLength: 1, maxLength: 13 })
    .map((chars) => chars.join(""));
  const arbList = (tabs: boolean) =>
    fc
      .tuple(
        fc.array(
          tabs ? arbId.map((id) => (id.length > 2 ? `${id.slice(0, 1)} ${id.slice(1)}` : id)) : arbId,
          {
            minLength: 1,
            maxLength: 12,
          },
        ),
        fc.array(
          fc.record({
            parent: fc.nat(11),
            child: fc.nat(11),
            // Usual lines, and lines that go the long way: CR, spaces around, one id, blank.
            shape: fc.constantFrom("edge", "edge", "edge", "again", "cr", "padded", "one", "blank"),
            gap: fc.integer({ min: 1, max: 3 }),
          }),
          { minLength: 1, maxLength: 60 },
        ),
      )
      .map(([pool, specs]) => {
        const lines = [tabs ? `${pool[0]}\t${pool[pool.length - 1]}` : `${pool[0]} ${pool[pool.length - 1]}`];
        let last = 0;
        for (const { parent, child, shape, gap } of specs) {
          const p = shape === "again" ? last : parent % pool.length;
          last = p;
          const sep = tabs ? "\t" : " ".repeat(gap);
          const edge = `${pool[p]}${sep}${pool[child % pool.length]}`;
          if (shape === "cr") lines.push(`${edge}\r`);
          else if (shape === "padded") lines.push(tabs ? edge : ` ${edge}  `);
          else if (shape === "one") lines.push(pool[p]);
          else if (shape === "blank") lines.push(tabs ? "" : "  ");
          else lines.push(edge);
        }
        return lines;
      });

  for (const tabs of [false, true]) {
    it(`reads ${tabs ? "tab" : "space"}-separated lists as a line-by-line reading does, whole and in pieces`, async () => {
      await fc.assert(
        fc.asyncProperty(arbList(tabs), fc.array(fc.nat(), { maxLength: 4 }), async (lines, cuts) => {
          const bytes = Buffer.from(`${lines.join("\n")}\n`);
          const want = expected(lines, tabs);
          const whole = await edgeListStream(Readable.from([bytes]), { maxNodes: 1e9, rootName: "r" });
          expect(read(whole)).toEqual(want);
          const at = [...new Set(cuts.map((c) => c % bytes.length))].sort((a, b) => a - b);
          const pieces = [0, ...at].map((s, i) => bytes.subarray(s, i < at.length ? at[i] : bytes.length));
          const streamed = await edgeListStream(Readable.from(pieces.filter((p) => p.length > 0)), {
            maxNodes: 1e9,
            rootName: "r",
          });
          expect(read(streamed)).toEqual(want);
        }),
        { numRuns: 300 },
      );
    });
  }
});
