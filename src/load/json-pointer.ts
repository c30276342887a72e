import { EspalierError } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import type { InputFormat, LoadOptions } from "./load-options.js";

/**
 * A JSON Pointer (RFC 6901) as its reference tokens, unescaped: `/a~1b/0` is `["a/b", "0"]`, and the
 * empty pointer (the whole document) is `[]`.
 */
export type PointerTokens = readonly string[];

/**
 * Parses `--start-at`'s pointer by RFC 6901 section 3: empty, or `/` before each reference token, where
 * `~0` stands for `~` and `~1` for `/` (decoded in that order, section 4) and no other `~` may appear.
 * USAGE otherwise.
 */
export function parsePointer(pointer: string): PointerTokens {
  if (pointer === "") return [];
  if (pointer[0] !== "/") {
    throw new EspalierError(
      "USAGE",
      `--start-at takes a JSON Pointer (RFC 6901): empty, or "/" before each key or index, as /data/items; "${pointer}" does not start with "/"`,
      undefined,
      { option: "--start-at" },
    );
  }
  return pointer
    .slice(1)
    .split("/")
    .map((token) => {
      if (/~(?![01])/.test(token)) {
        throw new EspalierError(
          "USAGE",
          `--start-at: "${pointer}" has a "~" not followed by 0 or 1 (RFC 6901 writes "~" as ~0 and "/" as ~1)`,
          undefined,
          { option: "--start-at" },
        );
      }
      return token.replace(/~1/g, "/").replace(/~0/g, "~");
    });
}

/**
 * The array index a reference token names (RFC 6901 section 4: `0`, or digits not starting with `0`);
 * undefined for any other token (`-`, `01`, a key).
 */
export function arrayIndex(token: string): number | undefined {
  if (!/^(0|[1-9][0-9]*)$/.test(token)) return undefined;
  const n = Number(token);
  return Number.isSafeInteger(n) ? n : undefined;
}

/** The pointer of the first `count` tokens, escaped again: what a message names as "where it stops". */
export function pointerPrefix(tokens: PointerTokens, count: number): string {
  return tokens
    .slice(0, count)
    .map((t) => `/${t.replace(/~/g, "~0").replace(/\//g, "~1")}`)
    .join("");
}

/** `--start-at` reads into a JSON or YAML document; USAGE for an input read as anything else. */
export function startAtFormat(format: InputFormat): void {
  if (format === "json" || format === "rows" || format === "yaml") return;
  throw new EspalierError(
    "USAGE",
    `--start-at applies to JSON and YAML documents; this input is read as ${format === "paths" ? "a path list" : format.toUpperCase()}`,
    undefined,
    { option: "--start-at" },
  );
}

/** Nodes read under `--start-at`, their reading saying which part of the document they are (the header names it). */
export function readAtPointer<N extends LinkedNodes | GraphNodes>(nodes: N, options: LoadOptions): N {
  if (!options.startAt) return nodes;
  if ("edgeFrom" in nodes) nodes.startAt = options.startAt;
  else if (nodes.reading !== undefined) nodes.reading = { ...nodes.reading, startAt: options.startAt };
  return nodes;
}
