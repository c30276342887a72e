import { Kind, type NestedAccess } from "../walk-nested.js";
import { SAMPLE_DEPTH, type Sample, SCALAR, sampleWidth } from "./sample.js";

/** A {@link Sample} of a parsed document (YAML), through the walker's view of it. */
export function sampleNested<V>(root: V, access: NestedAccess<V>): Sample {
  const keys: string[] = [];
  const values: V[] = [];
  const sample = (v: V, depth: number): Sample => {
    const kind = access.kind(v);
    if (kind === Kind.Seq) {
      if (depth >= SAMPLE_DEPTH) return { kind: "array", items: [] };
      const items = access.items(v).slice(0, sampleWidth(depth));
      return { kind: "array", items: items.map((item) => sample(item, depth + 1)) };
    }
    if (kind === Kind.Map) {
      if (depth >= SAMPLE_DEPTH) return { kind: "object", entries: [] };
      keys.length = 0;
      values.length = 0;
      access.entries(v, keys, values);
      const n = Math.min(keys.length, sampleWidth(depth));
      const own = keys.slice(0, n);
      const ownValues = values.slice(0, n);
      return { kind: "object", entries: own.map((key, k) => [key, sample(ownValues[k], depth + 1)]) };
    }
    return SCALAR;
  };
  return sample(root, 0);
}
