import { isMap, isScalar, LineCounter, parseDocument } from "yaml";
import * as z from "zod";
import { EspalierError, type SourcePos } from "../errors.js";
import { readLimits } from "../load/read-limits.js";
import { didYouMeanText } from "./did-you-mean.js";
import type { CliIO } from "./io.js";
import { configSchema } from "./options.js";
import { issueMessage } from "./validate-options.js";

export { configSchema };

/** File names looked for in the current directory when --config is not given. */
export const CONFIG_FILES = [".espalier.yaml", ".espalier.yml"] as const;

export type ConfigValues = Record<string, unknown>;

export interface LoadedConfig {
  /** Where the values came from; undefined when no file was found. */
  file: string | undefined;
  /** The keys the file sets, validated. */
  values: ConfigValues;
  /** Where each key stands in the file (1-based line and column). */
  keyPos: ReadonlyMap<string, SourcePos>;
}

const NO_CONFIG: LoadedConfig = { file: undefined, values: {}, keyPos: new Map() };

/**
 * Reads the config named by --config, or else the first of {@link CONFIG_FILES} that exists. A
 * malformed or invalid file is a USAGE error naming the file, line and key.
 */
export async function loadConfig(io: CliIO, explicit: string | undefined): Promise<LoadedConfig> {
  const candidates = explicit !== undefined ? [explicit] : [...CONFIG_FILES];
  for (const file of candidates) {
    let bytes: Buffer;
    try {
      bytes = await io.readFile(file, {
        maxBytes: readLimits.maxConfigBytes,
        what: "the config",
        pipes: false,
      });
    } catch (err) {
      if (err instanceof EspalierError) throw err;
      if (explicit === undefined && (err as NodeJS.ErrnoException).code === "ENOENT") continue;
      throw new EspalierError(
        "IO",
        `cannot read the config ${file}: ${(err as NodeJS.ErrnoException).code ?? err}`,
        { file },
      );
    }
    return { file, ...parseConfigWithPositions(new TextDecoder().decode(bytes), file) };
  }
  return NO_CONFIG;
}

/** Validates config text; returns only the keys it sets. */
export function parseConfig(text: string, file: string): ConfigValues {
  return parseConfigWithPositions(text, file).values;
}

function parseConfigWithPositions(
  text: string,
  file: string,
): { values: ConfigValues; keyPos: Map<string, SourcePos> } {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter });
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    throw new EspalierError("USAGE", `the config is not valid YAML: ${e.message.split("\n")[0]}`, {
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
  const raw = doc.toJS({ maxAliasCount: 50 }) ?? {};
  if (typeof raw !== "object" || Array.isArray(raw))
    throw new EspalierError("USAGE", "the config must be a mapping of option names to values", { file });
  const parsed = configSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    if (issue.code === "unrecognized_keys") {
      const key = issue.keys[0];
      throw new EspalierError(
        "USAGE",
        `config key ${key} is not an option${didYouMeanText(key, Object.keys(configSchema.shape))}`,
        keyPos.get(key) ?? { file },
        { key },
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

/** The JSON Schema (draft 2020-12) of the config file, published as docs/config.schema.json. */
export function configJsonSchema(): Record<string, unknown> {
  return {
    $id: "https://espalier.invalid/schema/config-1.json",
    title: "espalier configuration",
    ...z.toJSONSchema(configSchema, { target: "draft-2020-12", io: "input" }),
  };
}
