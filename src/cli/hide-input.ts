import { EspalierError } from "../errors.js";
import { pseudonymousInput } from "../model/pseudonym.js";

/**
 * Runs a command's work; under `--pseudonymize` (a key) every error it throws leaves with the input's
 * names, ids and paths replaced by pseudonyms and any other input text hidden (see
 * {@link EspalierError.hidingInput}). The one place error text is made private, so a new loader that
 * quotes input through `quoted` gets it for free.
 */
export async function hidingInput<T>(key: string | undefined, work: () => Promise<T>): Promise<T> {
  if (key === undefined) return work();
  try {
    return await work();
  } catch (err) {
    throw hideInputIn(err, key);
  }
}

/** The error as it may be printed under `--pseudonymize`. */
export function hideInputIn(err: unknown, key: string): unknown {
  if (err instanceof EspalierError) return err.hidingInput(pseudonymousInput(key));
  // An engine limit (call stack, string length) is reported as LIMIT_EXCEEDED; anything else is a bug,
  // whose message might quote input: neither message is shown.
  if (err instanceof RangeError) return new RangeError("an engine limit was reached");
  return new Error("an unexpected error (its details are not shown under --pseudonymize)");
}
