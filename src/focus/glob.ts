import { EspalierError } from "../errors.js";
import type { Measures } from "../model/measure.js";
import { parseSegment, splitPath } from "../model/segment.js";
import type { Tree } from "../model/tree.js";

/** Whether a focus spec uses glob syntax (`*` within a segment, `**` across segments). */
export function isGlob(spec: string): boolean {
  return spec.includes("*");
}

type Step = { kind: "any" } | { kind: "name"; test: (name: string) => boolean };

const MAX_STEPS = 30;

function compileStep(raw: string): Step {
  if (raw === "**") return { kind: "any" };
  const { name } = parseSegment(raw.replace(/\*/g, "\u0000"));
  const source = name
    .split("\u0000")
    .map((part) => part.replace(/[.*+?^${}()|[\]\\]/g, "\\$&"))
    .join(".*");
  const re = new RegExp(`^${source}$`, "su");
  return { kind: "name", test: (n) => re.test(n) };
}

/**
 * All nodes a glob matches, in pre-order. `*` matches any run of characters within one name, `**`
 * any number of whole segments (zero included). One forward pass with a bit set of pattern positions
 * per node, so the cost is linear in the tree whatever the pattern.
 */
export function matchGlob(tree: Tree, measures: Measures, spec: string): number[] {
  const steps = splitPath(spec).map(compileStep);
  if (steps.length > MAX_STEPS)
    throw new EspalierError("FOCUS_SYNTAX", `a glob may have at most ${MAX_STEPS} segments: ${spec}`);
  const accept = 1 << steps.length;
  const closure = (mask: number): number => {
    let m = mask;
    for (let s = 0; s < steps.length; s++) if (m & (1 << s) && steps[s].kind === "any") m |= 1 << (s + 1);
    return m;
  };
  const n = tree.length;
  const state = new Int32Array(n);
  const out: number[] = [];
  state[0] = closure(1);
  if (state[0] & accept) out.push(0);
  const { count } = measures;
  for (let i = 1; i < n; i++) {
    const from = state[tree.parent[i]];
    if (from === 0) {
      i += count[i] - 1; // nothing below can match: skip the subtree
      continue;
    }
    let to = 0;
    const name = tree.name.get(i);
    for (let s = 0; s < steps.length; s++) {
      if (!(from & (1 << s))) continue;
      const step = steps[s];
      if (step.kind === "any") to |= 1 << s;
      else if (step.test(name)) to |= 1 << (s + 1);
    }
    to = closure(to);
    state[i] = to;
    if (to & accept) out.push(i);
  }
  return out;
}
