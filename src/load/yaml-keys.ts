import { isScalar, Scalar } from "yaml";

/** Whether a mapping key is the merge key: `<<` written plain (a quoted "<<" is an ordinary key). */
export function isMergeKey(key: unknown): boolean {
  if (!isScalar(key) || (key.type !== undefined && key.type !== Scalar.PLAIN)) return false;
  const value = key.value;
  return value === "<<" || (typeof value === "symbol" && value.description === "<<");
}

/**
 * A mapping key as text: a scalar's value ("" for null), else the key as written. A plain key the
 * schema reads as a number or a boolean is the name as written ({@link scalarAsWritten}); the merge
 * key, which `%YAML 1.1` documents give as a symbol, is `<<`.
 */
export function keyText(key: unknown): string {
  if (!isScalar(key)) return String(key);
  const value = key.value;
  if (value === null || value === undefined) return "";
  if (typeof value === "symbol") return value.description ?? "";
  if (typeof value === "boolean") return scalarAsWritten(key);
  return typeof value === "string" ? value : scalarAsWritten(key);
}

/**
 * A scalar read as a number (or a boolean) as its text is written: YAML's core schema reads a plain
 * `3.10` as the float 3.1, `0o17` as 15, `1e3` as 1000 (YAML 1.2.2, 10.3.2), and a `%YAML 1.1`
 * document `y` and `on` as true; as a name or a key (a version, a code) the text is what was meant,
 * and two keys `3.1` and `3.10` are two names, not one printed twice.
 */
export function scalarAsWritten(v: Scalar): string {
  return typeof v.source === "string" && v.source !== "" ? v.source : String(v.value);
}
