import { EspalierError, quoted, say } from "../errors.js";

// Path segments use the escaping of RFC 6901 (JSON Pointer), section 3: "~" -> "~0", "/" -> "~1".

/** Escapes one name for use as a path segment. */
export function escapeSegment(name: string): string {
  return name.indexOf("~") === -1 && name.indexOf("/") === -1
    ? name
    : name.replace(/~/g, "~0").replace(/\//g, "~1");
}

/** A parsed segment: the name it stands for, and which of several equal-named siblings (1 = first). */
export interface Segment {
  name: string;
  /** 1-based rank among siblings with the same name; written as a `~~N` suffix when N >= 2. */
  rank: number;
}

/**
 * Parses one escaped segment. `~~N` at the end (N >= 2) picks the N-th sibling of that name: RFC 6901
 * never produces `~~`, so the suffix cannot clash with an escaped name.
 */
export function parseSegment(text: string): Segment {
  let body = text;
  let rank = 1;
  const dup = /~~([0-9]+)$/.exec(text);
  if (dup && Number(dup[1]) >= 2) {
    body = text.slice(0, dup.index);
    rank = Number(dup[1]);
  }
  if (body.indexOf("~") === -1) return { name: body, rank };
  let out = "";
  for (let i = 0; i < body.length; i++) {
    const ch = body[i];
    if (ch !== "~") {
      out += ch;
      continue;
    }
    const next = body[i + 1];
    if (next === "0") out += "~";
    else if (next === "1") out += "/";
    else
      throw new EspalierError(
        "FOCUS_SYNTAX",
        say`"~" must be followed by 0 or 1 in a path segment (RFC 6901 escaping: ~0 is "~", ~1 is "/"): ${quoted.value(text)}; a name holding "~" is written ${quoted.value(text.replace(/~(?![01])/g, "~0"))}`,
      );
    i++;
  }
  return { name: out, rank };
}

/**
 * Splits a path into raw (still escaped) segments. The root is "" ; a leading "/" is accepted and then
 * the text is read exactly as an RFC 6901 pointer, so "/" names the member whose name is empty.
 */
export function splitPath(path: string): string[] {
  if (path === "") return [];
  if (path.startsWith("/")) return path.slice(1).split("/");
  return path.split("/");
}
