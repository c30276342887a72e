import * as z from "zod";
import { optionsObjectSchema } from "./option-schema.js";
import { configOptions } from "./options.js";

// The config file's zod schema, made on first use: only a run that reads a config file (or writes the
// published JSON Schema) loads zod at all (start-up, issue 14).

function makeConfigSchema() {
  return optionsObjectSchema(configOptions)
    .partial()
    .strict()
    .describe("espalier project configuration (.espalier.yaml)");
}

let madeConfigSchema: ReturnType<typeof makeConfigSchema> | undefined;

/** The options a config file may set (every key optional; unknown keys refused). */
export function configSchema(): ReturnType<typeof makeConfigSchema> {
  madeConfigSchema ??= makeConfigSchema();
  return madeConfigSchema;
}

/** The JSON Schema (draft 2020-12) of the config file, published as docs/config.schema.json. */
export function configJsonSchema(): Record<string, unknown> {
  return {
    $id: "https://espalier.invalid/schema/config-1.json",
    title: "espalier configuration",
    ...z.toJSONSchema(configSchema(), { target: "draft-2020-12", io: "input" }),
  };
}
