import { EspalierError, type SourcePos } from "../errors.js";
import { readLimits } from "../load/read-limits.js";
import type { ConfigValues } from "./config-text.js";
import type { CliIO } from "./io.js";
import type { ReadBound } from "./read-bounded.js";

/** File names looked for in the current directory when --config is not given. */
export const CONFIG_FILES = [".espalier.yaml", ".espalier.yml"] as const;

export interface LoadedConfig {
  /** Where the values came from; undefined when no file was found. */
  file: string | undefined;
  /** The keys the file sets, validated. */
  values: ConfigValues;
  /** Where each key stands in the file (1-based line and column). */
  keyPos: ReadonlyMap<string, SourcePos>;
}

const NO_CONFIG: LoadedConfig = { file: undefined, values: {}, keyPos: new Map() };

/** A config file: a regular file (never a device or a pipe, links followed), at most maxConfigBytes. */
export const CONFIG_BOUND: ReadBound = {
  maxBytes: readLimits.maxConfigBytes,
  what: "the config",
  pipes: false,
};

/**
 * Reads the config named by --config, or else the first of {@link CONFIG_FILES} that exists. A
 * malformed or invalid file is a USAGE error naming the file, line and key.
 */
export async function loadConfig(io: CliIO, explicit: string | undefined): Promise<LoadedConfig> {
  const candidates = explicit !== undefined ? [explicit] : [...CONFIG_FILES];
  for (const file of candidates) {
    let bytes: Buffer;
    try {
      bytes = await io.readFile(file, CONFIG_BOUND);
    } catch (err) {
      if (err instanceof EspalierError) throw err;
      if (explicit === undefined && (err as NodeJS.ErrnoException).code === "ENOENT") continue;
      throw new EspalierError(
        "IO",
        `cannot read the config ${file}: ${(err as NodeJS.ErrnoException).code ?? err}`,
        { file },
      );
    }
    // The YAML reader loads only when there is a file to read (start-up: most runs have none).
    const { parseConfigWithPositions } = await import("./config-text.js");
    return { file, ...parseConfigWithPositions(new TextDecoder().decode(bytes), file) };
  }
  return NO_CONFIG;
}
