import { shownLabel } from "../model/safe-text.js";
import type { ViewNode } from "../view/view-node.js";
import { amount, formatCount, type NumberOptions, percent } from "./amount.js";
import type { LineGroup } from "./line-groups.js";
import type { LineParts } from "./line-layout.js";
import { MARK } from "./marks.js";
import { parentsText, referencesText, referenceText } from "./reference-text.js";

export { MARK };

/**
 * The node converter of every line-based format: what the line of `group` says. The chain's labels,
 * the numbers of its top node (itself and all below it: the line's names, the lines below and the
 * fold), then the mark, fold and parents of its last node, so that `nodes = the line's names + the
 * nodes on the lines below + hidden` holds on every line, and a size less the sizes below and the
 * hidden size is the own size of the line's names. A diff adds its fields on top (see `diffLineParts`).
 */
export function lineParts<T extends ViewNode>(group: LineGroup<T>, options: NumberOptions): LineParts {
  const { level, nodes } = group;
  const last = nodes[nodes.length - 1];
  const role = last.focus ? "focus" : last.onPath ? "path" : "other";
  // A reference (graphs) is a line of its own that says where its node's full entry is.
  const top = nodes[0];
  if (top.reference) {
    const where = referenceText(top.reference);
    return {
      level,
      mark: MARK.reference,
      role: role === "focus" ? "path" : role,
      tag: "",
      shortTag: "",
      tagKind: null,
      labels: [shownLabel(top.label)],
      numbers: where,
      compactNumbers: where,
      // No count to keep: where the path does not fit, the mark alone says the entry is elsewhere
      // (a `?` would read as a count cut).
      countNumbers: "",
      fold: "",
      foldCounts: "",
      compactFold: "",
      foldShort: "",
      foldTiny: "",
    };
  }
  // A focus with several parents (graphs) says so after its fold.
  const parents = parentsText(last.parents);
  const compact = { ...options, compact: true, countsExact: true };
  // The numbers count the whole line: its top node and all below it (a chain's upper nodes' own sizes
  // included), so the line above adds up from the lines below it; the fold is the last node's.
  const say = (o: NumberOptions) => {
    const numbers = amount(top.nodes, top.size, o);
    const share = shareOf(group, top, o);
    const said = share ? (numbers ? `${numbers}, ${share}` : share) : numbers;
    // An entry that is an empty object in the input says so: it counts as a node like any other.
    return last.empty ? (said ? `${said}, ${EMPTY_WORDS}` : EMPTY_WORDS) : said;
  };
  const fold = (o: NumberOptions) =>
    joined(last.hidden ? `(${foldWords(last)}, ${foldAmount(group, last, o)})` : "", parents);
  return {
    level,
    mark: MARK[role],
    role,
    tag: "",
    shortTag: "",
    tagKind: null,
    labels: chainLabels(group),
    ...distinctPart(group),
    numbers: say(options),
    compactNumbers: say(compact),
    // The line's count as its full numbers give it: the top node's, a chain's names included; exact,
    // so the line's sum can be checked to the node (a name gives way first, see layoutLine).
    countNumbers: amount(top.nodes, 0, { ...options, compact: false, sizes: false }),
    fold: fold(options),
    foldCounts: joined(last.hidden ? `(hidden: ${foldAmount(group, last, options)})` : "", parents),
    compactFold: fold(compact),
    compactFoldCounts: joined(last.hidden ? `(hidden: ${foldAmount(group, last, compact)})` : "", parents),
    foldShort: joined(
      last.hidden ? `(hidden: ${hiddenCount(last.hidden.nodes, options, last.hidden)})` : "",
      parents,
    ),
    foldTiny: last.hidden ? `(${hiddenTiny(last.hidden)})` : "",
    ...(last.hidden && options.sizes
      ? {
          foldSized: joined(`(${hiddenSized(group, last, options)})`, parents),
          compactFoldSized: joined(`(${hiddenSized(group, last, compact)})`, parents),
        }
      : {}),
    // A graph's fold of references only may go where its count does not fit (see `foldOnlyReferences`).
    ...(last.hidden && last.hidden.nodes === 0 ? { foldOnlyReferences: true as const } : {}),
    // One name and all below it folded: its count is 1 + the fold's (see `countInFold`).
    ...(last.hidden && last.children.length === 0 && nodes.length === 1
      ? { countInFold: true as const }
      : {}),
    // All below the line folded: the fold's size is the line's less its own (see `foldAllBelow`).
    ...(last.hidden && options.sizes && last.children.length === 0
      ? {
          foldAllBelow: joined(
            `(${hiddenSized(group, last, { ...options, sizes: false, share: undefined })})`,
            parents,
          ),
        }
      : {}),
  };
}

/**
 * The fold's numbers with its count said as `41 hidden` (`41 hidden, 2.0 MiB`): `foldAmount` in
 * fewest words, every number kept.
 */
export function hiddenSized<T extends ViewNode>(
  group: LineGroup<T>,
  node: T,
  options: NumberOptions,
): string {
  const n = node.hidden!.nodes;
  const count = amount(n, 0, { ...options, sizes: false, always: true });
  return `${formatCount(n, options.compact && !options.countsExact)} hidden${foldAmount(group, node, options).slice(count.length)}`;
}

/** What marks an empty entry (an input object with no field, `{}`) on its line and in a fold. */
export const EMPTY_WORDS = "empty {}";

/** Two parts of a line's end, two spaces apart, either may be empty. */
function joined(a: string, b: string): string {
  return a && b ? `${a}  ${b}` : a || b;
}

/**
 * The labels a line names, top first, each a name of its own: a root named "/" (an absolute path
 * listing) prints `/ / usr / bin`, so the line's count can be checked by its names (a glued `/usr`
 * read as one name left the sum one short); a chain typed glued, `/usr / bin`, still reads back as a
 * focus (see focus/printed-chain.ts).
 */
export function chainLabels<T extends ViewNode>({ nodes }: LineGroup<T>): string[] {
  return nodes.map((n) => shownLabel(n.label));
}

/**
 * `41 nodes` (or `1 node`), exact: what a narrow line's fold keeps, `(hidden: 41 nodes)`, then
 * `(41 hidden)`, so `nodes = 1 + the lines below + hidden` can still be checked on it. A graph's fold
 * that hides no node, only references (`folded`), says how many (`0 nodes, 4 references`): a bare
 * `0 nodes` would not say what is hidden.
 */
export function hiddenCount(n: number, options: NumberOptions, folded?: { references?: number }): string {
  return amount(n, 0, { ...options, compact: false, sizes: false, always: true }) + onlyReferences(n, folded);
}

/**
 * A fold's count in fewest words, `41 hidden`; a graph's fold of references only says them
 * (`0 hidden, 4 references`).
 */
export function hiddenTiny(folded: { nodes: number; references?: number }): string {
  return `${formatCount(folded.nodes)} hidden${onlyReferences(folded.nodes, folded)}`;
}

/** `, 4 references` after the count of a fold that hides no node but references (graphs); else "". */
function onlyReferences(n: number, folded: { references?: number } | undefined): string {
  return n === 0 ? referencesText(folded?.references) : "";
}

/** `hidden: 3 children` (or `1 child`): how many of the node's children the fold holds. */
export function foldWords(node: ViewNode): string {
  const k = node.hidden!.children;
  return `hidden: ${formatCount(k)} ${k === 1 ? "child" : "children"}`;
}

/** The numbers of what is folded under `node`: always with its count, and its share when asked. */
export function foldAmount<T extends ViewNode>(group: LineGroup<T>, node: T, options: NumberOptions): string {
  const { nodes, size, references, empty } = node.hidden!;
  const text =
    amount(nodes, size, { ...options, always: true }) +
    referencesText(references, options.compact) +
    (empty ? `, ${formatCount(empty)} ${EMPTY_WORDS}` : "");
  if (!options.share) return text;
  const whole = options.share === "total" ? group.root : node;
  const value = options.sizes ? size : nodes;
  const p = percent(value, options.sizes ? whole.size : whole.nodes);
  return p ? `${text}, ${p}` : text;
}

/** The node's share of the whole tree, or of the node on the line above, by size (or by count). */
function shareOf<T extends ViewNode>(group: LineGroup<T>, node: T, options: NumberOptions): string {
  if (!options.share) return "";
  const whole = options.share === "total" ? group.root : (group.above ?? group.root);
  return options.sizes ? percent(node.size, whole.size) : percent(node.nodes, whole.nodes);
}

/**
 * A one-name line's `distinct`: where its label first differs from each shown sibling's label (the
 * length of their common start). Siblings sorted by label, that length only falls walking away from
 * the label's place, so the walk stops at 0 (the first character tells the rest apart) or after
 * {@link NEAREST} labels each way.
 */
function distinctPart<T extends ViewNode>({ nodes, above }: LineGroup<T>): { distinct?: number[] } {
  if (nodes.length !== 1 || above === null || above.children.length < 2) return {};
  const self = shownLabel(nodes[0].label);
  let sorted = siblingLabels.get(above);
  if (sorted === undefined) {
    sorted = above.children.map((c) => shownLabel(c.label));
    sorted.sort();
    siblingLabels.set(above, sorted);
  }
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid] < self) lo = mid + 1;
    else hi = mid;
  }
  // An equal label (a sibling of the same name) cannot be told apart by any cut.
  if (lo + 1 < sorted.length && sorted[lo + 1] === self) return {};
  const places = new Set<number>();
  for (const step of [-1, 1]) {
    for (let k = lo + step, n = 0; k >= 0 && k < sorted.length && n < NEAREST; k += step, n++) {
      const common = prefix(self, sorted[k]);
      places.add(common);
      if (common === 0) break;
    }
  }
  return places.size === 0 ? {} : { distinct: [...places] };
}

/** Sorted sibling labels compared on each side of a label for `distinctPart`. */
const NEAREST = 64;

/** Shown siblings' labels, sorted, per parent: computed once per parent for all its lines. */
const siblingLabels = new WeakMap<ViewNode, string[]>();

/** Code units two texts share at their start. */
function prefix(a: string, b: string): number {
  const n = Math.min(a.length, b.length);
  let k = 0;
  while (k < n && a.charCodeAt(k) === b.charCodeAt(k)) k++;
  return k;
}
