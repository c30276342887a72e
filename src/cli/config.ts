import { parseDocument } from "yaml";
import * as z from "zod";
import { EspalierError } from "../errors.js";
import { readLimits } from "../load/read-limits.js";
import type { CliIO } from "./io.js";
import { summaryOptionsSchema } from "./options.js";

/** File names looked for in the current directory when --config is not given. */
export const CONFIG_FILES = [".espalier.yaml", ".espalier.yml"] as const;

/**
 * A project config file: what a CI job would otherwise repeat on every call. Keys are the long
 * option names in camelCase (`parentField`, `budget`, `focus`, …); every key is optional, and a flag
 * given on the command line wins over the file.
 */
export const configSchema = summaryOptionsSchema
  .omit({ output: true, focusFrom: true, printSql: true })
  .extend({ exitCode: z.boolean().describe("diff only: exit 1 when the versions differ.") })
  .partial()
  .strict()
  .describe("espalier project configuration (.espalier.yaml)");

export type ConfigValues = Record<string, unknown>;

export interface LoadedConfig {
  /** Where the values came from; undefined when no file was found. */
  file: string | undefined;
  /** The keys the file sets, validated. */
  values: ConfigValues;
}

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
        {
          file,
        },
      );
    }
    return { file, values: parseConfig(new TextDecoder().decode(bytes), file) };
  }
  return { file: undefined, values: {} };
}

/** Validates config text; returns only the keys it sets. */
export function parseConfig(text: string, file: string): ConfigValues {
  const doc = parseDocument(text);
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    throw new EspalierError("USAGE", `the config is not valid YAML: ${e.message.split("\n")[0]}`, {
      file,
      line: e.linePos?.[0].line,
      column: e.linePos?.[0].col,
    });
  }
  const raw = doc.toJS({ maxAliasCount: 50 }) ?? {};
  if (typeof raw !== "object" || Array.isArray(raw))
    throw new EspalierError("USAGE", "the config must be a mapping of option names to values", { file });
  const parsed = configSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const key = issue.path.join(".") || (issue.code === "unrecognized_keys" ? issue.keys.join(", ") : "");
    throw new EspalierError("USAGE", `config key ${key}: ${issue.message}`, { file });
  }
  // Keep only what the file sets: defaults are the command line's business.
  const values: ConfigValues = {};
  for (const key of Object.keys(raw)) values[key] = (parsed.data as ConfigValues)[key];
  return values;
}

/**
 * Effective options: each option takes the command line's value when given there, else the
 * config's, else its default.
 */
export function mergeConfig(
  cli: ConfigValues,
  sourceOf: (key: string) => string | undefined,
  config: ConfigValues,
): ConfigValues {
  const out: ConfigValues = { ...cli };
  for (const [key, value] of Object.entries(config)) {
    const given =
      sourceOf(key) === "cli" || (key === "focus" && Array.isArray(cli.focus) && cli.focus.length > 0);
    if (!given) out[key] = value;
  }
  return out;
}

/** The JSON Schema (draft 2020-12) of the config file, published as docs/config.schema.json. */
export function configJsonSchema(): Record<string, unknown> {
  return {
    $id: "https://espalier.invalid/schema/config-1.json",
    title: "espalier configuration",
    ...z.toJSONSchema(configSchema, { target: "draft-2020-12", io: "input" }),
  };
}
