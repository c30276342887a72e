import { EspalierError } from "../errors.js";
import type { Measures } from "../model/measure.js";
import { parseSegment, splitPath } from "../model/segment.js";
import type { Tree } from "../model/tree.js";
import { compileWildcard, matchWildcard, type Wildcard } from "./wildcard.js";

/** Whether a focus spec uses glob syntax (`*` within a segment, `**` across segments). */
export function isGlob(spec: string): boolean {
  return spec.includes("*");
}

type Step = { kind: "any" } | { kind: "name"; pattern: Wildcard };

/** Most segments in a glob: the per-node state is a bit set of pattern positions in one integer. */
const MAX_STEPS = 30;
/** Longest glob, in UTF-16 code units; longer is FOCUS_SYNTAX (no name needs a pattern this long). */
export const MAX_GLOB_LENGTH = 4096;

function compileStep(raw: string): Step {
  if (raw === "**") return { kind: "any" };
  // The stars stand in as a code unit the segment does not use, so RFC 6901 unescaping leaves them be.
  const star = unusedCodeUnit(raw);
  return { kind: "name", pattern: compileWildcard(parseSegment(raw.replaceAll("*", star)).name, star) };
}

function unusedCodeUnit(text: string): string {
  let c = 0xe000;
  while (text.includes(String.fromCharCode(c))) c++;
  return String.fromCharCode(c);
}

/**
 * All nodes a glob matches, in pre-order. `*` matches any run of characters within one name, `**`
 * any number of whole segments (zero included). One forward pass with a bit set of pattern positions
 * per node; each name is tested without backtracking ({@link matchWildcard}), so the cost is linear in
 * the names' total length times the glob's segments, whatever the pattern.
 */
export function matchGlob(tree: Tree, measures: Measures, spec: string): number[] {
  if (spec.length > MAX_GLOB_LENGTH)
    throw new EspalierError(
      "FOCUS_SYNTAX",
      `a glob may be at most ${MAX_GLOB_LENGTH} characters long; this one has ${spec.length}`,
    );
  const raw = splitPath(spec);
  if (raw.length > MAX_STEPS)
    throw new EspalierError(
      "FOCUS_SYNTAX",
      `a glob may have at most ${MAX_STEPS} segments; this one has ${raw.length}`,
    );
  const steps = raw.map(compileStep);
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
      else if (matchWildcard(step.pattern, name)) to |= 1 << (s + 1);
    }
    to = closure(to);
    state[i] = to;
    if (to & accept) out.push(i);
  }
  return out;
}
