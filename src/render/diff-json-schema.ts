import * as z from "zod";
import { diffSchema } from "./diff-schema.js";

/** The JSON Schema (draft 2020-12) of the diff JSON, generated from the zod schema. */
export function diffJsonSchema(): Record<string, unknown> {
  return {
    $id: "https://espalier.invalid/schema/diff-1.json",
    title: "espalier diff",
    ...z.toJSONSchema(diffSchema, { target: "draft-2020-12" }),
  };
}
