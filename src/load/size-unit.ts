import type { TreeReading } from "../model/tree.js";

/**
 * What the sizes of nodes and records count, decided at load time: bytes only when the input says so,
 * by a size field named `bytes`; other size fields (a cost, a head count, a `size` of anything) are
 * plain numbers. Path lists and documents read as values count bytes by what they are.
 */
export function fieldSizeUnit(sizeField: string): TreeReading["sizeUnit"] {
  return sizeField.toLowerCase() === "bytes" ? "bytes" : "number";
}
