import { EspalierError } from "../../../src/errors.js";
import { ROWS_IN_OBJECT } from "../../../src/load/json/json-loader.js";
import type { LoadOptions } from "../../../src/load/load-options.js";
import { isRowsValue } from "../../../src/load/rows-shape.js";
import { linkTable } from "../../../src/load/table/link-table.js";
import { rowsTable } from "../../../src/load/table/rows-table.js";
import { Kind, type NestedAccess, walkNested } from "../../../src/load/walk-nested.js";
import type { LinkedNodes } from "../../../src/model/linked-nodes.js";
import { jsonErrorOffset } from "./json-error-offset.js";
import { lineColumnAt } from "./line-column.js";

// The whole-text JSON reader espalier had before every load went through the byte loaders, kept as a
// reference answer: JSON.parse (ECMA-262), with the parse error's offset taken from the engine's message
// or from an RFC 8259 scanner (json-error-offset.ts), and a walk over the parsed value.

/**
 * Loads JSON text: nested nodes, or rows (a top-level array of flat records) when `as` says so or, with
 * `as` undefined, when the value looks like rows (see {@link isRowsValue}).
 */
export function loadJson(text: string, options: LoadOptions, as?: "json" | "rows"): LinkedNodes {
  const value = parseJson(text);
  if (as === "rows" || (as === undefined && isRowsValue(value, options))) {
    if (!Array.isArray(value)) {
      const object = typeof value === "object" && value !== null;
      throw new EspalierError(
        "SHAPE",
        `rows must be a top-level array of objects${object ? ROWS_IN_OBJECT : ""}`,
      );
    }
    return linkTable(rowsTable(value), options);
  }
  return walkNested<unknown>(value, jsonAccess, options);
}

/** JSON.parse with PARSE_JSON at the line and column where the text stops being JSON. */
function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (error) {
    if (!(error instanceof SyntaxError)) throw error;
    const at = /at position (\d+)/.exec(error.message);
    let offset: number;
    if (at) offset = Number(at[1]);
    else if (/end of JSON input/.test(error.message)) offset = text.trimEnd().length;
    else offset = jsonErrorOffset(text);
    if (offset < 0 || offset >= text.length) offset = text.trimEnd().length;
    // V8 words it "… in JSON at position N" or "…, "<excerpt>" is not valid JSON"; keep the reason only.
    const reason = error.message
      .replace(/ in JSON at position \d+.*$/s, "")
      .replace(/, ".*" is not valid JSON$/s, "");
    throw new EspalierError("PARSE_JSON", `invalid JSON: ${reason}`, lineColumnAt(text, offset));
  }
}

type Json = unknown;

/** Plain values from JSON.parse. */
const jsonAccess: NestedAccess<Json> = {
  kind(v) {
    if (v === null || v === undefined) return Kind.Null;
    switch (typeof v) {
      case "object":
        return Array.isArray(v) ? Kind.Seq : Kind.Map;
      case "number":
        return Kind.Number;
      case "string":
        return Kind.String;
      case "boolean":
        return Kind.Boolean;
      default:
        return Kind.Other;
    }
  },
  field(map, key) {
    const v = (map as Record<string, Json>)[key];
    // A field name like "constructor" must not find Object.prototype's members; JSON has no functions.
    return typeof v === "function" || v === Object.prototype ? undefined : v;
  },
  items: (seq) => seq as Json[],
  entries(map, keys, values) {
    const record = map as Record<string, Json>;
    for (const key of Object.keys(record)) {
      keys.push(key);
      values.push(record[key]);
    }
  },
  number: (v) => v as number,
  text: (v) => String(v),
  source(v) {
    try {
      return JSON.stringify(v);
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
      throw new EspalierError("LIMIT_EXCEEDED", "a kept field is nested too deeply to print as a label");
    }
  },
  line: () => 0,
  pos: () => undefined,
  claim: () => -1, // parsed JSON has no aliases: every value is reached once
  target: (v) => v,
};
