import type { Command } from "commander";
import { stringify } from "yaml";
import { EspalierError } from "../errors.js";
import { loadConfig, mergeConfig } from "./config.js";
import type { CliIO } from "./io.js";

/** Options that steer the config itself, never stored in it. */
const CONFIG_SWITCHES = new Set(["config", "printConfig", "output", "focusFrom", "printSql"]);

/**
 * The options a command runs with: its flags over the project config file over the defaults. The
 * config is `--config FILE`, else `.espalier.yaml` in the current directory; `--no-config` skips it.
 */
export async function effectiveOptions(
  command: Command,
  raw: Record<string, unknown>,
  io: CliIO,
): Promise<{ values: Record<string, unknown>; configFile: string | undefined }> {
  if (raw.config === false) return { values: raw, configFile: undefined };
  const explicit = typeof raw.config === "string" ? raw.config : undefined;
  const config = await loadConfig(io, explicit);
  const values = mergeConfig(raw, (key) => command.getOptionValueSource(key), config.values);
  return { values, configFile: config.file };
}

/** The effective configuration as YAML, as `--print-config` shows it (a valid config file itself). */
export function printConfig(values: Record<string, unknown>, configFile: string | undefined): string {
  const shown: Record<string, unknown> = {};
  for (const key of Object.keys(values).sort()) {
    if (CONFIG_SWITCHES.has(key) || values[key] === undefined) continue;
    shown[key] = values[key];
  }
  const source = configFile === undefined ? "no config file" : `config file: ${configFile}`;
  return `# effective espalier configuration (${source}; flags override it)\n${stringify(shown)}`;
}

/** The input argument, required unless only the configuration is printed. */
export function requireInput(input: string | undefined): string {
  if (input === undefined)
    throw new EspalierError("USAGE", "missing the input: a file, or - for standard input");
  return input;
}
