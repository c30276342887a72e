import { describe, expect, it } from "vitest";
import { isArrayIndexKey } from "../../../src/load/json/keyed-order.js";

describe("isArrayIndexKey", () => {
  it("isArrayIndexKey(key) is true exactly for the keys JSON.parse orders first", () => {
    // ECMA-262 (from memory): an array index is a canonical numeric string of an integer below 2^32 - 1;
    // OrdinaryOwnPropertyKeys lists those first, ascending. JSON.parse is checked against it here.
    const keys = [
      "0",
      "7",
      "10",
      "007",
      "-1",
      "1.0",
      "4294967294",
      "4294967295",
      "99999999999",
      "",
      "1e3",
      " 1",
    ];
    for (const key of keys) {
      const parsed = JSON.parse(`{"z":0,${JSON.stringify(key)}:1}`);
      expect(isArrayIndexKey(key), key).toBe(Object.keys(parsed)[0] === key);
    }
  });
});
