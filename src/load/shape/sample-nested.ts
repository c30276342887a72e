import { Kind, type NestedAccess } from "../walk-nested.js";
import { SAMPLE_DEPTH, SAMPLE_MEMBERS, type Sample, SCALAR, sampleWidth } from "./sample.js";

/**
 * A {@link Sample} of a parsed document (YAML), through the walker's view of it: in document order, at
 * most {@link SAMPLE_MEMBERS} members in all (the containers met after that are sampled empty).
 */
export function sampleNested<V>(root: V, access: NestedAccess<V>): Sample {
  const keys: string[] = [];
  const values: V[] = [];
  let left = SAMPLE_MEMBERS;
  const sample = (v: V, depth: number): Sample => {
    const kind = access.kind(v);
    if (kind === Kind.Seq) {
      if (depth >= SAMPLE_DEPTH || left <= 0) return { kind: "array", items: [] };
      const items = access.items(v).slice(0, Math.min(sampleWidth(depth), left));
      left -= items.length;
      return { kind: "array", items: items.map((item) => sample(item, depth + 1)) };
    }
    if (kind === Kind.Map) {
      if (depth >= SAMPLE_DEPTH || left <= 0) return { kind: "object", entries: [] };
      keys.length = 0;
      values.length = 0;
      access.entries(v, keys, values);
      const n = Math.min(keys.length, sampleWidth(depth), left);
      left -= n;
      const own = keys.slice(0, n);
      const ownValues = values.slice(0, n);
      return { kind: "object", entries: own.map((key, k) => [key, sample(ownValues[k], depth + 1)]) };
    }
    return SCALAR;
  };
  return sample(root, 0);
}
