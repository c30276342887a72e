// Writes docs/*.schema.json from the zod schemas in the built package (run after `npm run build`).
import { writeFileSync } from "node:fs";
import { configJsonSchema } from "../dist/cli/config-schema.js";
import { diffJsonSchema } from "../dist/render/diff-json-schema.js";
import { summaryJsonSchema } from "../dist/render/summary-json-schema.js";

const write = (name, schema) => {
  writeFileSync(new URL(`../docs/${name}`, import.meta.url), `${JSON.stringify(schema, null, 2)}\n`);
  console.log(`wrote docs/${name}`);
};
write("summary.schema.json", summaryJsonSchema());
write("diff.schema.json", diffJsonSchema());
write("config.schema.json", configJsonSchema());
