import { CHAIN_JOIN } from "../model/chain-join.js";
import type { PathIndex } from "../model/path-index.js";
import { shownLabel } from "../model/safe-text.js";

/**
 * Whether a focus spec reads as a chain copied from a printed line: names joined by " / ", as a line
 * prints a run of only children (`services / ledger / src`).
 */
export function isPrintedChain(spec: string): boolean {
  return spec.includes(CHAIN_JOIN);
}

/**
 * The nodes a chain copied from a printed line names: each node whose name is the chain's last and
 * whose ancestors, upwards, bear the chain's other names, every node below the chain's top being its
 * parent's only child (as on a printed line: a chain never joins a node with siblings). The names are
 * compared as printed (`name`, or its escaped form, see `shownLabel`), not as path segments: no RFC
 * 6901 escapes. A root named "/" (an absolute path listing) prints as a name of its own, `/ / usr /
 * bin`; typed glued to its child, as paths write it (`/usr / bin`), it reads back too. With `nameOf` (pseudonyms), names are compared as that prints them. In
 * pre-order; empty when none.
 */
export function resolvePrintedChain(
  index: PathIndex,
  spec: string,
  nameOf?: (i: number) => string,
): number[] {
  const { tree, measures } = index;
  const names = spec.split(CHAIN_JOIN);
  const printed = nameOf ?? ((i: number) => tree.name.get(i));
  const rootName = printed(0);
  if (rootName === "/" && names[0].length > 1 && names[0].startsWith("/"))
    names.splice(0, 1, "/", names[0].slice(1));
  const is = (i: number, name: string): boolean => {
    const own = printed(i);
    // A name holding `\u{` itself prints with that backslash escaped: as typed, it is another name's print.
    if (own === name) return nameOf !== undefined || !name.includes("\\u{");
    // Only a name printed escaped (see safeText) or empty (`""`) differs from its printed form.
    const escaped = name === '""' || name.includes("\\u{") || name.includes("[...]");
    return nameOf === undefined && escaped && shownLabel(own) === name;
  };
  const last = names[names.length - 1];
  const { count } = measures;
  const out: number[] = [];
  for (let i = 0; i < tree.length; i++) {
    if (!is(i, last)) continue;
    let node = i;
    let k = names.length - 2;
    for (; k >= 0; k--) {
      const up = tree.parent[node];
      // A chain's lower node is its parent's only child: the parent's subtree is the child's and itself.
      if (up < 0 || count[up] !== count[node] + 1 || !is(up, names[k])) break;
      node = up;
    }
    if (k < 0) out.push(i);
  }
  return out;
}
