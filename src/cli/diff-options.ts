import * as z from "zod";
import { summaryOptionsSchema } from "./options.js";

/** Options of `espalier diff`: every option of a summary, plus `--exit-code`. */
export const diffOptionsSchema = summaryOptionsSchema.extend({
  exitCode: z.boolean().default(false).describe("Exit 1 when the versions differ, 0 when they do not."),
});

export type DiffCliOptions = z.infer<typeof diffOptionsSchema>;
