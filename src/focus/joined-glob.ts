import type { PathIndex } from "../model/path-index.js";
import { splitPath } from "../model/segment.js";
import { matchGlob } from "./glob.js";

/** Places between two plain segments of a glob that may be tried as one name containing "/". */
const MAX_JOINS = 4;

/**
 * A glob that matched nothing, rewritten so that adjacent segments (not `**`) form one name containing
 * "/", escaped as `~1` (RFC 6901, section 3): `@tidewater/ledger/*` typed for the children of the
 * package named `@tidewater/ledger` is `@tidewater~1ledger/*`, and `harbor/@tidewater/*` for the
 * packages of that scope under harbor is `harbor/@tidewater~1*`. The rewrite with the fewest joins,
 * leftmost first, that matches a node; undefined when none does. Only the first {@link MAX_JOINS} such
 * places are tried (at most 2^4 - 1 globs, each one pass over the tree), so an error stays quick.
 */
export function joinedGlob(index: PathIndex, spec: string): string | undefined {
  let raw: string[];
  try {
    raw = splitPath(spec);
  } catch {
    return undefined;
  }
  const lead = spec.startsWith("/") ? "/" : "";
  // Any two segments but `**` (which spans levels) and a rank suffix (`~~2`) may be one name.
  const joinable = (s: string) => s !== "" && s !== "**" && !/~~[0-9]+$/.test(s);
  const places: number[] = [];
  for (let k = 0; k + 1 < raw.length && places.length < MAX_JOINS; k++)
    if (joinable(raw[k]) && joinable(raw[k + 1])) places.push(k);
  if (places.length === 0) return undefined;
  const choices: number[] = [];
  for (let mask = 1; mask < 1 << places.length; mask++) choices.push(mask);
  // Fewest joins first; among as many, the leftmost.
  choices.sort((a, b) => bits(a) - bits(b) || lowest(a) - lowest(b) || a - b);
  for (const mask of choices) {
    let text = raw[0];
    for (let k = 1; k < raw.length; k++) {
      const at = places.indexOf(k - 1);
      text += at >= 0 && mask & (1 << at) ? `~1${raw[k]}` : `/${raw[k]}`;
    }
    const glob = lead + text;
    try {
      if (matchGlob(index.tree, index.measures, glob).length > 0) return glob;
    } catch {
      return undefined;
    }
  }
  return undefined;
}

function bits(mask: number): number {
  let n = 0;
  for (let m = mask; m !== 0; m &= m - 1) n++;
  return n;
}

function lowest(mask: number): number {
  return mask & -mask;
}
