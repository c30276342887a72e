// Writes docs/*.schema.json from the zod schemas in the built package (run after `npm run build`).
import { writeFileSync } from "node:fs";
import { summaryJsonSchema } from "../dist/render/summary-json-schema.js";

writeFileSync(
  new URL("../docs/summary.schema.json", import.meta.url),
  `${JSON.stringify(summaryJsonSchema(), null, 2)}\n`,
);
console.log("wrote docs/summary.schema.json");
