import * as z from "zod";
import { summarySchema } from "./summary-schema.js";

/** The JSON Schema (draft 2020-12) of the summary JSON, generated from the zod schema. */
export function summaryJsonSchema(): Record<string, unknown> {
  return {
    $id: "https://espalier.invalid/schema/summary-1.json",
    title: "espalier summary",
    ...z.toJSONSchema(summarySchema, { target: "draft-2020-12" }),
  };
}
