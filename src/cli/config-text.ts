import { isMap, isScalar, LineCounter, parseDocument } from "yaml";
import { didYouMean } from "../did-you-mean.js";
import { EspalierError, type SourcePos } from "../errors.js";
import { configSchema } from "./config-schema.js";
import { issueMessage } from "./validate-options.js";

/** The keys a config file sets, as read (validated against `configSchema()`). */
export type ConfigValues = Record<string, unknown>;

/** Validates config text; returns only the keys it sets. */
export function parseConfig(text: string, file: string): ConfigValues {
  return parseConfigWithPositions(text, file).values;
}

export function parseConfigWithPositions(
  text: string,
  file: string,
): { values: ConfigValues; keyPos: Map<string, SourcePos> } {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter });
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    // The parser's own "at line N, column M:" is left out: the position leads the line.
    const reason = e.message.replace(/ at line \d+, column \d+:.*$/s, "").split("\n")[0];
    throw new EspalierError("USAGE", `the config is not valid YAML: ${reason}`, {
      file,
      line: e.linePos?.[0].line,
      column: e.linePos?.[0].col,
    });
  }
  const keyPos = new Map<string, SourcePos>();
  if (isMap(doc.contents)) {
    for (const item of doc.contents.items) {
      if (isScalar(item.key) && item.key.range) {
        const { line, col } = lineCounter.linePos(item.key.range[0]);
        keyPos.set(String(item.key.value), { file, line, column: col });
      }
    }
  }
  let raw: object | null;
  try {
    raw = (doc.toJS({ maxAliasCount: 50 }) as object | null) ?? {};
  } catch (err) {
    // The YAML library refuses a document whose aliases expand too far (an alias bomb).
    if (!(err instanceof ReferenceError)) throw err;
    throw new EspalierError(
      "LIMIT_EXCEEDED",
      "the config uses its aliases (*name) more than 50 times; write the values out",
      { file },
    );
  }
  if (typeof raw !== "object" || raw === null || Array.isArray(raw))
    throw new EspalierError("USAGE", "the config must be a mapping of option names to values", { file });
  const parsed = configSchema().safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    if (issue.code === "unrecognized_keys") {
      const key = issue.keys[0];
      const suggestion = didYouMean(key, Object.keys(configSchema().shape));
      throw new EspalierError(
        "USAGE",
        `config key ${key} is not an option${suggestion === undefined ? "" : `; did you mean ${suggestion}?`}`,
        keyPos.get(key) ?? { file },
        suggestion === undefined ? { key } : { key, suggestion },
      );
    }
    const key = String(issue.path[0]);
    throw new EspalierError(
      "USAGE",
      issueMessage(issue, `config key ${key}`, (raw as Record<string, unknown>)[key]),
      keyPos.get(key) ?? { file },
      {
        key,
      },
    );
  }
  // Keep only what the file sets: defaults are the command line's business.
  const values: ConfigValues = {};
  for (const key of Object.keys(raw)) values[key] = (parsed.data as ConfigValues)[key];
  return { values, keyPos };
}
