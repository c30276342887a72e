import { EspalierError } from "../errors.js";
import { loadConfig } from "./config.js";
import type { CliIO } from "./io.js";
import {
  allOptions,
  controlOptions,
  type NamedOptions,
  type OptionSpec,
  type OptionsOf,
  type OptionsSchema,
} from "./options.js";
import { type CommandLine, flagsByKey } from "./parse-command-line.js";
import { validateOptions } from "./validate-options.js";

/** The options a command runs with, and the config file they came from (if any). */
export interface EffectiveOptions<T> {
  options: T;
  configFile: string | undefined;
  /** Keys whose value came from the config file. */
  fromConfig: ReadonlySet<string>;
}

/**
 * The options a command runs with: its flags over the project config file over the defaults, validated
 * against `schema`. The config is `--config FILE`, else `.espalier.yaml` in the current directory;
 * `--without-config` skips it. A config key the command does not take (a diff-only key for a summary) is left
 * out; `focus` on the command line replaces the config's list rather than adding to it.
 */
export async function effectiveOptions<T extends Record<string, OptionSpec>>(
  line: CommandLine,
  schema: OptionsSchema<T>,
  takes: Record<string, OptionSpec>,
  io: CliIO,
): Promise<EffectiveOptions<OptionsOf<T> & NamedOptions>> {
  const { given } = line;
  if (given.config !== undefined && given.withoutConfig === true)
    throw new EspalierError("USAGE", "--config and --without-config cannot be given together", undefined, {
      option: "--without-config",
    });
  const config =
    given.withoutConfig === true
      ? undefined
      : await loadConfig(io, typeof given.config === "string" ? given.config : undefined);
  const values: Record<string, unknown> = {};
  const fromConfig = new Set<string>();
  for (const key of Object.keys(takes)) {
    if (key in controlOptions) continue;
    if (given[key] !== undefined) values[key] = given[key];
    else if (config && config.values[key] !== undefined) {
      values[key] = config.values[key];
      fromConfig.add(key);
    }
  }
  const options = validateOptions(schema.table, values, (key) =>
    fromConfig.has(key)
      ? { name: `config key ${key}`, pos: config?.keyPos.get(key) ?? { file: config?.file } }
      : { name: flagsByKey.get(key)?.long ?? key },
  );
  // Which options were named (flag or config), for checks that tell a default from a value asked for.
  const named: NamedOptions = { named: new Set(Object.keys(values)) };
  return { options: Object.assign(options, named), configFile: config?.file, fromConfig };
}

/**
 * The effective configuration as YAML, as `--options-in-effect` shows it: the options given (flags and
 * config file) as keys, then every other option's default as a comment. The keys are a config file that
 * gives the same run: a default written as a key would count as given, and some options given on an
 * input they do not fit are refused (`sizeField: size` on a path list is FIELD_MISSING), so a printed
 * configuration kept as `.espalier.yaml` failed every run on such an input.
 */
export async function optionsInEffectYaml(
  values: Record<string, unknown> & NamedOptions,
  configFile: string | undefined,
): Promise<string> {
  // The YAML library loads only for this (start-up: a plain run never writes YAML).
  const { stringify } = await import("yaml");
  const given: Record<string, unknown> = {};
  const defaults: Record<string, unknown> = {};
  for (const key of Object.keys(values).sort()) {
    if (!(key in allOptions) || allOptions[key].config === false || values[key] === undefined) continue;
    if (values.named?.has(key) === true) given[key] = values[key];
    else defaults[key] = values[key];
  }
  const source = configFile === undefined ? "no config file" : `config file: ${configFile}`;
  const head = `# effective espalier configuration (${source}; flags override it)\n`;
  const keys = Object.keys(given).length > 0 ? stringify(given) : "";
  const rest = stringify(defaults).replace(/^(?=.)/gm, "# ");
  return `${head}${keys}# the defaults, not given (as keys they would count as given):\n${rest}`;
}
