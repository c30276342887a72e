import { expect } from "vitest";
import { NamePool, type Names, namesToArray, PrefixedNames, StringNames } from "../../src/model/names.js";

// Names compare by the texts they read back, never by how they are stored: a pool keeps unused bytes
// (names set twice, truncated nodes) that are no part of its value.
const isNames = (x: unknown): x is Names =>
  x instanceof NamePool || x instanceof StringNames || x instanceof PrefixedNames;

expect.addEqualityTesters([
  (a: unknown, b: unknown) => {
    if (!isNames(a) && !isNames(b)) return undefined;
    const list = (x: unknown) => (isNames(x) ? namesToArray(x) : x);
    return JSON.stringify(list(a)) === JSON.stringify(list(b));
  },
]);
