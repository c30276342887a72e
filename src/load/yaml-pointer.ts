import { type Document, isAlias, isMap, isSeq, type LineCounter, type Node } from "yaml";
import { EspalierError, quoted, quotedList, say } from "../errors.js";
import { arrayIndex, parsePointer, pointerPrefix } from "./json-pointer.js";
import { isMergeKey, keyText } from "./yaml-keys.js";

/** How many of a mapping's keys a "has no member" message lists. */
const KEYS_LISTED = 12;
/** How deep merge keys (`<<: *base`) are followed when looking a key up. */
const MAX_MERGE_DEPTH = 64;

/**
 * The node of a YAML document that `--start-at`'s JSON Pointer (RFC 6901) refers to, read as the whole
 * document: a key is looked up among a mapping's own keys, then among those it merges in (`<<`), and an
 * alias on the way is followed to its anchor. FIELD_MISSING where the path stops, at that node's line,
 * naming the keys or the length found there.
 */
export function yamlAtPointer(doc: Document, pointer: string, lineCounter: LineCounter): Node | null {
  const tokens = parsePointer(pointer);
  let node = follow(doc, doc.contents as Node | null);
  for (let k = 0; k < tokens.length; k++) {
    const token = tokens[k];
    const where = k === 0 ? "the document" : pointerPrefix(tokens, k);
    const fail = (what: ReturnType<typeof say>): never => {
      const at = lineCounter.linePos(node?.range?.[0] ?? 0);
      throw new EspalierError(
        "FIELD_MISSING",
        say`--start-at ${pointer}: ${what}`,
        {
          line: at.line,
          column: at.col,
        },
        { option: "--start-at" },
      );
    };
    if (isMap(node)) {
      const found = member(doc, node, token, 0);
      if (found === undefined) {
        const keys = ownKeys(node);
        fail(
          say`${where} has no member ${quoted.name(token)} (its keys: ${quotedList("name", keys.slice(0, KEYS_LISTED), KEYS_LISTED)}${keys.length > KEYS_LISTED ? ` and ${keys.length - KEYS_LISTED} more` : ""})`,
        );
      }
      node = follow(doc, found ?? null);
    } else if (isSeq(node)) {
      const index = arrayIndex(token);
      if (index === undefined)
        fail(say`${where} is a list, and ${quoted.name(token)} is no index of one (0, 1, 2 and so on)`);
      if (index! >= node.items.length)
        fail(
          say`${where} is a list of ${node.items.length} ${node.items.length === 1 ? "element" : "elements"}, with no index ${token}`,
        );
      node = follow(doc, node.items[index!] as Node | null);
    } else {
      fail(say`${where} is a single value (no mapping or list), so ${quoted.name(token)} is not in it`);
    }
  }
  if (tokens.length > 0 && !isMap(node) && !isSeq(node)) {
    // A lone value holds no hierarchy: a one-node tree with exit 0 would hide the mistake.
    const at = lineCounter.linePos(node?.range?.[0] ?? 0);
    throw new EspalierError(
      "SHAPE",
      say`--start-at ${pointer} refers to a single value (no mapping or list), which holds no tree: point at the mapping or list that holds it${tokens.length > 1 ? ` (${pointerPrefix(tokens, tokens.length - 1)})` : ""}`,
      { line: at.line, column: at.col },
      { option: "--start-at" },
    );
  }
  return node;
}

/** An alias's anchored node; any other node as it is. */
function follow(doc: Document, node: Node | null | undefined): Node | null {
  if (isAlias(node)) return (node.resolve(doc) as Node | undefined) ?? null;
  return node ?? null;
}

/** The value of `key` in `map`: its own pair, else the first mapping it merges in that has one. */
function member(doc: Document, map: Node, key: string, depth: number): Node | null | undefined {
  if (!isMap(map) || depth > MAX_MERGE_DEPTH) return undefined;
  for (const pair of map.items)
    if (!isMergeKey(pair.key) && keyText(pair.key) === key) return pair.value as Node | null;
  for (const pair of map.items) {
    if (!isMergeKey(pair.key)) continue;
    const value = follow(doc, pair.value as Node | null);
    const sources = isSeq(value) ? value.items.map((item) => follow(doc, item as Node | null)) : [value];
    for (const source of sources) {
      const found = source === null ? undefined : member(doc, source, key, depth + 1);
      if (found !== undefined) return found;
    }
  }
  return undefined;
}

function ownKeys(map: Node): string[] {
  return isMap(map) ? map.items.filter((pair) => !isMergeKey(pair.key)).map((pair) => keyText(pair.key)) : [];
}
