import { isMap, parseDocument } from "yaml";
import { EspalierError } from "../errors.js";
import type { Importance } from "../interest/importance.js";

/** Whether a file name is written as a config file (YAML) rather than a --focus-from list. */
export function isConfigName(file: string): boolean {
  return /\.ya?ml$/i.test(file);
}

/** What the view writes: the foci, and the budget and importance that complete the view. */
export interface FociToWrite {
  /** Printed focus paths (pseudonymous with a key), in pre-order. */
  foci: readonly string[];
  budget: number;
  importance: Importance;
}

/**
 * The text of a --focus-from file: one focus per line, as that option reads them (verbatim, blank
 * lines skipped). A path that holds a line break cannot be written so: CONFIG's YAML can carry it.
 */
export function focusListText(what: FociToWrite): string {
  if (what.foci.some((f) => /[\r\n]/.test(f)))
    throw new EspalierError("USAGE", "a focus path holds a line break: write a .yaml file instead");
  if (what.foci.some((f) => f === ""))
    throw new EspalierError("USAGE", "the root cannot be a line of a focus list");
  return what.foci.map((f) => `${f}\n`).join("");
}

/**
 * A config file (`.espalier.yaml`) with `focus`, `budget` and `importance` set to the view's, every
 * other key and every comment of `existing` kept. A file that is not valid YAML, or not a mapping, is
 * refused rather than overwritten.
 */
export function configText(existing: string | null, what: FociToWrite): string {
  const doc = parseDocument(existing ?? "");
  if (doc.errors.length > 0)
    throw new EspalierError("USAGE", `the file is not valid YAML: ${doc.errors[0].message.split("\n")[0]}`);
  if (doc.contents !== null && !isMap(doc.contents))
    throw new EspalierError("USAGE", "the file is not a mapping of option names to values");
  doc.set("focus", [...what.foci]);
  doc.set("budget", what.budget);
  if (what.importance !== "depth" || doc.has("importance")) doc.set("importance", what.importance);
  return doc.toString();
}
