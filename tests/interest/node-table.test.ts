import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { NodeTable } from "../../src/interest/node-table.js";

describe("NodeTable", () => {
  it("answers get and set as a Map of the same entries does, through every growth", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 5000 }), fc.integer({ min: 0, max: 1e6 })), {
          maxLength: 400,
        }),
        fc.array(fc.integer({ min: 0, max: 5000 }), { maxLength: 100 }),
        (sets, probes) => {
          const table = new NodeTable(1);
          const map = new Map<number, number>();
          for (const [node, value] of sets) {
            table.set(node, value);
            map.set(node, value);
          }
          for (const node of [...map.keys(), ...probes]) expect(table.get(node)).toBe(map.get(node) ?? -1);
        },
      ),
    );
  });
});
