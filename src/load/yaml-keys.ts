import { isScalar, Scalar } from "yaml";

/** Whether a mapping key is the merge key: `<<` written plain (a quoted "<<" is an ordinary key). */
export function isMergeKey(key: unknown): boolean {
  if (!isScalar(key) || (key.type !== undefined && key.type !== Scalar.PLAIN)) return false;
  const value = key.value;
  return value === "<<" || (typeof value === "symbol" && value.description === "<<");
}

/** A mapping key as text: a scalar's value ("" for null), else the key as written. */
export function keyText(key: unknown): string {
  if (isScalar(key)) return key.value === null || key.value === undefined ? "" : String(key.value);
  return String(key);
}
