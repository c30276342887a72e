import type { InputText } from "../errors.js";

/**
 * A stable pseudonym for a name: the first 12 hex digits of HMAC-SHA-256(secret, name) (RFC 2104,
 * FIPS 180-4). The same secret gives the same pseudonym in every run, so outputs stay diffable;
 * without the secret the name cannot be recomputed from a guess list.
 */
export function pseudonym(secret: string, name: string): string {
  crypto ??= process.getBuiltinModule("node:crypto");
  return `${PSEUDONYM_PREFIX}${crypto.createHmac("sha256", secret).update(name, "utf8").digest("hex").slice(0, 12)}`;
}

/** What every pseudonym starts with, before its 12 hex digits. */
export const PSEUDONYM_PREFIX = "anon-";

/** Whether `text` starts with a pseudonym (`anon-` and 12 hex digits). */
export function startsPseudonymous(text: string): boolean {
  return /^anon-[0-9a-f]{12}/.test(text);
}

// The crypto module loads on the first pseudonym, not with this module: most runs make none, and
// loading it is a good part of a small run's start (issue 14).
let crypto: typeof import("node:crypto") | undefined;

/**
 * How input text quoted in an error prints under `--pseudonymize`: a name or an id as its pseudonym, a
 * node path segment by segment, anything else (a value, a parser's excerpt) as `(hidden)`; so an error
 * line in a CI log shows no more of the input than the output does.
 */
export function pseudonymousInput(secret: string): (t: InputText) => string {
  return (t) => {
    if (t.kind === "name" || t.kind === "id") return JSON.stringify(pseudonym(secret, t.text));
    if (t.kind === "path")
      return JSON.stringify(
        t.text
          .split("/")
          .map((seg) => (seg === "" ? "" : pseudonym(secret, seg)))
          .join("/"),
      );
    return "(hidden)";
  };
}
