import {
  type Alias,
  isAlias,
  isMap,
  isScalar,
  isSeq,
  LineCounter,
  type Node,
  parseDocument,
  visit,
} from "yaml";
import { EspalierError, quoted, say } from "../errors.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import type { LoadOptions } from "./load-options.js";
import { Kind, type NestedAccess, walkNested } from "./walk-nested.js";

type YamlValue = Node | null;

/**
 * Loads a YAML document of nested nodes (the shapes JSON allows), walking the parsed nodes themselves so
 * origins are line numbers. Aliases are followed, never expanded: a node or children list reached twice
 * is TWO_PARENTS, so an alias bomb cannot blow up.
 */
export function loadYaml(text: string, options: LoadOptions): LinkedNodes {
  const lineCounter = new LineCounter();
  let doc: ReturnType<typeof parseDocument>;
  try {
    doc = parseDocument(text, { lineCounter, uniqueKeys: true });
  } catch (error) {
    if (error instanceof RangeError) {
      throw new EspalierError("LIMIT_EXCEEDED", "the YAML is nested too deeply to parse; convert it to JSON");
    }
    throw error;
  }
  if (doc.errors.length > 0) {
    const error = doc.errors[0];
    const at = error.linePos?.[0] ?? lineCounter.linePos(error.pos[0]);
    const pos = { line: at.line, column: at.col };
    if (error.code === "RESOURCE_EXHAUSTION") {
      // The YAML parser recurses per nesting level and gives up a few hundred levels down.
      throw new EspalierError(
        "LIMIT_EXCEEDED",
        "the YAML is nested too deeply to parse; convert it to JSON",
        pos,
      );
    }
    const reason = error.message.replace(/ at line \d+, column \d+:.*$/s, "");
    throw new EspalierError("PARSE_YAML", say`invalid YAML (${error.code}): ${quoted.excerpt(reason)}`, pos);
  }
  const root = doc.contents as YamlValue;
  if (root === null || (isScalar(root) && root.value === null)) {
    throw new EspalierError("INPUT_EMPTY", "the YAML document holds no value");
  }

  // An alias stands for the last node with its anchor before it, in document order.
  const target = new Map<Alias, Node>();
  if (text.includes("*")) {
    const anchored = new Map<string, Node>();
    visit(doc, {
      Node(_, node) {
        if (isAlias(node)) {
          const found = anchored.get(node.source);
          if (found) target.set(node, found);
        } else if (node.anchor) {
          anchored.set(node.anchor, node);
        }
      },
    });
  }
  // Values stay as written (an alias is kept, so positions point at it); each use looks through it.
  const deref = (v: YamlValue | undefined): YamlValue => (isAlias(v) ? (target.get(v) ?? null) : (v ?? null));
  const placed = new Set<Node>();

  const access: NestedAccess<YamlValue> = {
    kind(value) {
      const v = deref(value);
      if (v === null) return Kind.Null;
      if (isMap(v)) return Kind.Map;
      if (isSeq(v)) return Kind.Seq;
      if (!isScalar(v)) return Kind.Other;
      switch (typeof v.value) {
        case "number":
        case "bigint":
          return Kind.Number;
        case "string":
          return Kind.String;
        case "boolean":
          return Kind.Boolean;
        default:
          return v.value === null || v.value === undefined ? Kind.Null : Kind.Other;
      }
    },
    field(value, key) {
      const map = deref(value);
      if (!isMap(map)) return undefined;
      for (const pair of map.items) if (keyText(pair.key) === key) return pair.value as YamlValue;
      return undefined;
    },
    items(value) {
      const seq = deref(value);
      return isSeq(seq) ? (seq.items as YamlValue[]) : [];
    },
    entries(value, keys, values) {
      const map = deref(value);
      if (!isMap(map)) return;
      for (const pair of map.items) {
        keys.push(keyText(pair.key));
        values.push(pair.value as YamlValue);
      }
    },
    number(value) {
      const v = deref(value);
      return isScalar(v) ? Number(v.value) : Number.NaN;
    },
    text(value) {
      const v = deref(value);
      return isScalar(v) ? String(v.value) : "";
    },
    source(value) {
      const range = deref(value)?.range;
      return range ? text.slice(range[0], range[1]) : "";
    },
    line: (v) => (v?.range ? lineCounter.linePos(v.range[0]).line : 0),
    pos(v) {
      if (!v?.range) return undefined;
      const at = lineCounter.linePos(v.range[0]);
      return { line: at.line, column: at.col };
    },
    claim(value) {
      // Only an anchored node can be reached twice.
      const v = deref(value);
      if (v === null || !("anchor" in v) || !v.anchor) return true;
      if (placed.has(v)) return false;
      placed.add(v);
      return true;
    },
  };
  return walkNested<YamlValue>(root, access, options);
}

/** A mapping key as text: a scalar's value ("" for null), else the key as written. */
function keyText(key: unknown): string {
  if (isScalar(key)) return key.value === null || key.value === undefined ? "" : String(key.value);
  return String(key);
}
