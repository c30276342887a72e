import { EspalierError, type MessagePart, quoted, say } from "../errors.js";
import { buildTree } from "../model/build-tree.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import { measure } from "../model/measure.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";
import { parsePointer } from "./json-pointer.js";
import type { LoadOptions } from "./load-options.js";
import { OutputHead } from "./output-head.js";

/** The summary format read back (render/summary-schema.ts SUMMARY_FORMAT; a test keeps the two equal). */
export const SAVED_SUMMARY_FORMAT = "espalier-summary/1";

/** The name of the entry that stands for a saved fold: no name espalier prints for a node looks so. */
export const FOLD_NAME = "(folded)";

/**
 * The field each node of a saved view holds: on a fold's entry, what the fold hid ("5 children, 117
 * nodes"); "" on a shown node. A label can show it (`{folded}`), and a diff compares it by default, so
 * a fold whose count changed is edited even where its size did not.
 */
export const FOLDED_FIELD = "folded";

/**
 * The format id espalier's own JSON outputs write (render/summary-json.ts, render/diff-json.ts) when a
 * whole JSON text is such an output, in any order of its members and any spacing (output-head.ts);
 * else undefined. A text that does not hold "espalier-" is none, told by one native search.
 */
export function savedOutputFormat(text: string): string | undefined {
  if (!text.includes("espalier-")) return undefined;
  return new OutputHead().read(text) ?? undefined;
}

/**
 * Whether a JSON text whose format is `format` (see {@link savedOutputFormat}) is read by
 * {@link loadSavedOutput}: unless `--read-as values` asks for its JSON text.
 */
export function readsAsSaved(format: string | undefined, options: Pick<LoadOptions, "readAs">): boolean {
  return format !== undefined && options.readAs !== "values";
}

interface SavedNode {
  name: string;
  path: string;
  id?: string;
  nodes: number;
  size: number;
  empty?: boolean;
  children: SavedNode[];
  hidden: { children: number; nodes: number; size: number; empty?: number } | null;
}

/**
 * espalier's own summary JSON read as the view it holds (docs/input.md, "espalier's own output"): each
 * shown node a node, and each fold one leaf named {@link FOLD_NAME} that stands for the nodes and size
 * it hides (its hidden nodes but itself counted as elided descendants, model/tree.ts), so that every
 * node's total, the root's included, is the saved document's. A saved diff, another version of the
 * format, a graph's summary (whose reference lines may point into folds) or a document whose counts do
 * not add up is SHAPE, saying what to run instead: nothing is read with totals that differ from the
 * saved ones.
 */
export function loadSavedOutput(text: string, format: string, options: LoadOptions): Tree {
  refuseOtherFormats(format);
  refuseOptions(options);
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let doc: unknown;
  try {
    doc = JSON.parse(body);
  } catch (err) {
    throw parseError(body, err);
  }
  if (!isRecord(doc)) throw notValid("it is not a JSON object");
  const totals = doc.totals;
  if (!isRecord(totals) || !isCount(totals.nodes) || !isSize(totals.size))
    throw notValid('its "totals" are not a count of nodes and a size');
  const input = isRecord(doc.input) ? doc.input : {};
  if (input.shape === "graph") throw graphRefused();
  const start = startNode(doc, options.startAt);
  const linked = linkedFrom(start);
  const tree = buildTree(linked.nodes, options.file);
  if (tree.length !== linked.saved.length) throw notValid("its nodes are not one tree");
  const folds = linked.elided.reduce((k, _, i) => k + (linked.saved[i] === null ? 1 : 0), 0);
  const notes: ReadingNote[] = [savedNote(folds)];
  // Read whole, a root espalier added above the input's top-level nodes is one still: a diff compares
  // it with the other version's root whatever each is named (diff/align-roots.ts), as it compares the
  // inputs themselves, and --pseudonymize prints its name (the input's) as it did.
  const whole = !options.startAt;
  const read: Tree = {
    ...tree,
    syntheticRoot: tree.syntheticRoot || (whole && addedRoot(linked.saved[0], input)),
    elided: linked.elided,
    reading: {
      shape: "nodes",
      sizeUnit: input.sizeUnit === "bytes" ? "bytes" : "number",
      ...(options.startAt ? { startAt: options.startAt } : {}),
      // A listing's root that stood for the listed folder still does (read whole): a diff then compares
      // it with the other version's root whatever each is named, as it compares the listings themselves.
      ...(whole && input.rootIsStart === true ? { rootIsStart: true } : {}),
      // A nameless top node named after the input file, or a document read as values (its root the
      // document, named after the file), still is one: a diff names it as the other version's.
      ...(whole &&
      (input.rootNamed === "nameless" || (input.shape === "values" && input.rootNamed === undefined))
        ? { rootNamed: "nameless" as const }
        : {}),
      ...(linked.empty > 0 ? { emptyEntries: linked.empty } : {}),
      ...(options.keepOtherFields ? { otherFields: [FOLDED_FIELD] } : {}),
      notes,
    },
  };
  checkTotals(read, linked.saved, options.startAt ? undefined : totals);
  return read;
}

/**
 * Whether a saved summary's root is one espalier added and named after the input file: one the
 * summary says it added (input.rootNamed "added": above a path list's, a table's or a document's
 * top-level nodes), and in summaries that do not say so, one above a table's top-level rows (its id "",
 * which no row can have: an empty id cell is SHAPE) or a fact table's rollup (input.rolledUpRows). A
 * nameless top node named after the file (input.rootNamed "nameless") and a document read as values
 * (input.shape "values": its root is the document, named after the file) are the input's own root,
 * not an added one, as a load of the input reads them: the diff names it as the other version's
 * (diff/align-roots.ts), so it compares with a saved or loaded root alike.
 */
function addedRoot(root: SavedNode | null | undefined, input: Record<string, unknown>): boolean {
  return (
    input.rootNamed === "added" || root?.id === "" || (input.shape === "table" && isCount(input.rolledUpRows))
  );
}

/** A saved diff, or a format this version does not read: SHAPE naming what to run instead. */
function refuseOtherFormats(format: string): void {
  if (format === SAVED_SUMMARY_FORMAT) return;
  const diff = format.startsWith("espalier-diff/");
  throw new EspalierError(
    "SHAPE",
    diff
      ? `this is an espalier diff (${format}): the changes between two versions, not one tree, so it is not read as a tree; run espalier diff on the two inputs it compared, or read its JSON text with --read-as values`
      : `this is espalier output in a format this version does not read (${format}; it reads ${SAVED_SUMMARY_FORMAT}); run espalier on the original input, or read its JSON text with --read-as values`,
    undefined,
    { format },
  );
}

/** Options that say how to read an input's fields or links: a saved summary has its own, so USAGE. */
function refuseOptions(options: LoadOptions): void {
  const named: string[] = [...(options.linkOptionsNamed ?? [])];
  if (options.childrenFieldNamed) named.push("--children-field");
  if (options.sizeFieldNamed) named.push("--size-field");
  if (options.nameFieldNamed) named.push("--name-field");
  if (options.graph) named.push("--graph");
  if (options.nodeRecords !== undefined) named.push("--nodes");
  if (options.folderSizes === "total") named.push("--folder-sizes");
  const unique = [...new Set(named)];
  if (unique.length === 0) return;
  throw new EspalierError(
    "USAGE",
    `${unique.join(", ")} ${unique.length === 1 ? "does" : "do"} not apply: this input is an espalier summary (${SAVED_SUMMARY_FORMAT}), read as the view it holds; read its JSON text with --read-as values`,
    undefined,
    { options: unique },
  );
}

/** The node `--start-at` names (`/root`, `/root/children/0`, ...), or the root; else USAGE. */
function startNode(doc: Record<string, unknown>, pointer: string | undefined): unknown {
  const tokens = parsePointer(pointer ?? "");
  if (tokens.length === 0) return doc.root;
  let at: unknown = tokens[0] === "root" ? doc.root : undefined;
  for (let k = 1; at !== undefined && k < tokens.length; k += 2) {
    const list = isRecord(at) && tokens[k] === "children" ? at.children : undefined;
    const index = tokens[k + 1];
    at =
      Array.isArray(list) && index !== undefined && /^(0|[1-9][0-9]*)$/.test(index)
        ? list[Number(index)]
        : undefined;
  }
  if (at === undefined) {
    throw new EspalierError(
      "USAGE",
      `--start-at ${pointer} names no shown node of this espalier summary: it takes /root or /root/children/N (…/children/N), and a fold cannot be opened (run espalier on the original input with --focus to see inside one)`,
      undefined,
      { options: ["--start-at"] },
    );
  }
  return at;
}

interface Linked {
  nodes: LinkedNodes;
  /** Each slot's saved node; null for a fold's entry. */
  saved: (SavedNode | null)[];
  elided: Float64Array;
  /** Empty entries ({}) among the shown nodes and in folds. */
  empty: number;
}

/**
 * The saved view's nodes in pre-order (each fold's entry after its parent's shown children), checked
 * node by node as it is read: a node's fields are those the summary schema gives it, and its count
 * adds up (nodes = 1 + shown children's + folded), as espalier writes every summary.
 */
function linkedFrom(top: unknown): Linked {
  const names: string[] = [];
  const ids: string[] = [];
  const parents: number[] = [];
  const own: number[] = [];
  const elided: number[] = [];
  const saved: (SavedNode | null)[] = [];
  const empties: number[] = [];
  const folded: string[] = [];
  let hasIds = false;
  let empty = 0;
  const stack: { node: unknown; parent: number }[] = [{ node: top, parent: -1 }];
  while (stack.length > 0) {
    const { node: value, parent } = stack.pop()!;
    const node = savedNode(value);
    const slot = names.length;
    names.push(node.name);
    ids.push(node.id ?? "");
    if (node.id !== undefined) hasIds = true;
    parents.push(parent);
    saved.push(node);
    elided.push(node.elided ?? 0);
    empties.push(node.empty ? 1 : 0);
    folded.push(node.folded ?? "");
    if (node.empty) empty++;
    const hidden = node.hidden;
    let shown = 1 + (hidden?.nodes ?? 0);
    let inside = hidden?.size ?? 0;
    for (const child of node.children) {
      const c = savedNode(child);
      shown += c.nodes;
      inside += c.size;
    }
    if (shown !== node.nodes) {
      throw notValid(
        say`at node ${quoted.path(node.path)} it says ${String(node.nodes)} nodes and 1 + its shown children's + its fold's make ${String(shown)}`,
      );
    }
    own.push(Math.max(0, node.size - inside));
    // Children go on the stack last first, so they come off in input order; the fold after them.
    if (hidden !== null && hidden.children > 0) stack.push({ node: foldOf(node), parent: slot });
    for (let k = node.children.length - 1; k >= 0; k--) stack.push({ node: node.children[k], parent: slot });
    if (hidden !== null && hidden.children === 0 && (hidden.nodes !== 0 || hidden.size !== 0))
      throw notValid(say`at node ${quoted.path(node.path)} its fold hides no child but counts nodes or size`);
    if (hidden?.empty) empty += hidden.empty;
  }
  return {
    nodes: {
      parentOf: Int32Array.from(parents),
      name: names,
      ownSize: Float64Array.from(own),
      hasSizes: own.some((s) => s !== 0),
      ids: hasIds ? ids : null,
      origin: new Int32Array(names.length),
      originIsRow: false,
      fields: new Map([[FOLDED_FIELD, folded]]),
      rootName: names[0] ?? "",
      ...(empty > 0 ? { empty: Uint8Array.from(empties) } : {}),
    },
    saved: saved.map((s) => (s !== null && (s as FoldMark).fold ? null : s)),
    elided: Float64Array.from(elided),
    empty,
  };

  /** A fold's entry as a saved node of its own: a leaf counting the fold's nodes (elided but itself). */
  function foldOf(node: SavedNode): FoldMark {
    const hidden = node.hidden!;
    if (hidden.nodes < 1) throw graphRefused();
    const taken = new Set(node.children.map((c) => c.name));
    let name = FOLD_NAME;
    for (let k = 2; taken.has(name); k++) name = `(folded ${k})`;
    return {
      fold: true,
      name,
      path: node.path === "" ? name : `${node.path}/${name}`,
      ...(node.id !== undefined ? { id: `${FOLD_NAME} ${node.id}` } : {}),
      nodes: 1,
      size: hidden.size,
      children: [],
      hidden: null,
      elided: hidden.nodes - 1,
      folded: `${hidden.children} ${hidden.children === 1 ? "child" : "children"}, ${hidden.nodes} ${hidden.nodes === 1 ? "node" : "nodes"}`,
    };
  }
}

/** A fold's entry while the walk reads it. */
interface FoldMark extends SavedNode {
  fold?: true;
  elided?: number;
  /** What the fold hid, as the {@link FOLDED_FIELD} field says it. */
  folded?: string;
}

/** A saved node's fields checked (the summary schema's types); a fold's entry as {@link foldOf} made it. */
function savedNode(value: unknown): SavedNode & FoldMark {
  if (!isRecord(value)) throw notValid("a node is not a JSON object");
  if (value.fold === true) return value as unknown as FoldMark;
  const { name, path, id, nodes, size, children, hidden, reference, empty } = value;
  if (typeof name !== "string" || typeof path !== "string") throw notValid('a node has no "name" or "path"');
  if (reference !== undefined || value.parents !== undefined) throw graphRefused();
  if (!isCount(nodes) || !isSize(size) || !Array.isArray(children))
    throw notValid(say`node ${quoted.path(path)} has no count of "nodes", "size" or "children" list`);
  if (id !== undefined && typeof id !== "string")
    throw notValid(say`node ${quoted.path(path)} has an "id" that is no text`);
  let folded: SavedNode["hidden"] = null;
  if (hidden !== null) {
    if (!isRecord(hidden) || !isCount(hidden.children) || !isCount(hidden.nodes) || !isSize(hidden.size))
      throw notValid(say`node ${quoted.path(path)} has a "hidden" that is neither null nor a fold's counts`);
    if (hidden.references !== undefined) throw graphRefused();
    folded = {
      children: hidden.children,
      nodes: hidden.nodes,
      size: hidden.size,
      ...(isCount(hidden.empty) ? { empty: hidden.empty } : {}),
    };
  }
  return {
    name,
    path,
    ...(id !== undefined ? { id: id as string } : {}),
    nodes,
    size,
    ...(empty === true ? { empty: true } : {}),
    children,
    hidden: folded,
  };
}

/**
 * After the tree is built: every shown node's measured count and size are the saved ones, and the
 * root's are the saved `totals` (when the whole view is read); SHAPE otherwise, never other totals.
 */
function checkTotals(
  tree: Tree,
  saved: readonly (SavedNode | null)[],
  totals: Record<string, unknown> | undefined,
): void {
  const m = measure(tree);
  for (let i = 0; i < saved.length; i++) {
    const node = saved[i];
    if (node === null) continue;
    if (m.nodes[i] !== node.nodes || m.size[i] !== node.size) {
      throw notValid(
        say`at node ${quoted.path(node.path)} its saved count and size (${String(node.nodes)}, ${String(node.size)}) are not what its shown children and fold add up to (${String(m.nodes[i])}, ${String(m.size[i])})`,
      );
    }
  }
  if (totals !== undefined && (totals.nodes !== m.nodes[0] || totals.size !== m.size[0])) {
    throw notValid(
      `its "totals" (${String(totals.nodes)} nodes, size ${String(totals.size)}) are not its root's (${m.nodes[0]} nodes, size ${m.size[0]})`,
    );
  }
}

/** The note every saved summary read back carries: what a fold's entry is; count: the folds. */
function savedNote(folds: number): ReadingNote {
  return {
    code: "SAVED_VIEW",
    count: folds,
    parts: [
      `an espalier summary (${SAVED_SUMMARY_FORMAT}) read as the view it holds: `,
      folds === 0
        ? "it folds nothing"
        : `${folds === 1 ? "its one fold is" : `each of its ${folds} folds is`} one entry named ${FOLD_NAME} that stands for the nodes and size it hides, so every total is the saved one; a fold cannot be opened (run espalier on the original input for that), and a diff compares it as a whole, by its size and by what it hid (the field ${FOLDED_FIELD})`,
      "; --read-as values reads its JSON text instead",
    ],
  };
}

/**
 * PARSE_JSON at the line and column (UTF-16 units, as the JSON loader counts them) JSON.parse names by
 * its offset (a summary cut short in a CI log); at the end when it names none.
 */
function parseError(body: string, err: unknown): EspalierError {
  const at = /at position (\d+)/.exec(err instanceof Error ? err.message : "");
  const offset = at ? Math.min(Number(at[1]), body.length) : body.length;
  const before = body.slice(0, offset);
  const line = before.split("\n").length;
  const column = offset - (before.lastIndexOf("\n") + 1) + 1;
  return new EspalierError(
    "PARSE_JSON",
    `this espalier summary (${SAVED_SUMMARY_FORMAT}) is not valid JSON (RFC 8259)${at ? "" : ": it ends too soon"}; it may have been cut short or changed after espalier wrote it`,
    { line, column },
  );
}

function graphRefused(): EspalierError {
  return new EspalierError(
    "SHAPE",
    "this espalier summary has reference lines (a graph's nodes with several parents, or YAML aliases), which stand for entries its folds may hide, so it is not read back as a tree; run espalier on the original input, or read its JSON text with --read-as values",
  );
}

function notValid(why: string | readonly MessagePart[]): EspalierError {
  const parts = typeof why === "string" ? [why] : why;
  return new EspalierError("SHAPE", [
    `this espalier summary (${SAVED_SUMMARY_FORMAT}) cannot be read as the view it holds: `,
    ...parts,
    "; it was changed after espalier wrote it: run espalier on the original input, or read its JSON text with --read-as values",
  ]);
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function isCount(value: unknown): value is number {
  return Number.isSafeInteger(value) && (value as number) >= 0;
}

function isSize(value: unknown): value is number {
  return typeof value === "number" && Number.isFinite(value) && value >= 0;
}
