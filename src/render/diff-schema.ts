import * as z from "zod";
import { changeKinds } from "../diff/changes.js";
import {
  foldedSchema,
  type NodeFields,
  nodeFieldsShape,
  readingNoteSchema,
  unmatchedFociSchema,
} from "./summary-schema.js";

/** Name and version of the diff JSON; bump the number when a field changes meaning. */
export const DIFF_FORMAT = "espalier-diff/1";

const count = z.number().int().nonnegative();

export const changeCountsSchema = z
  .object({
    added: count,
    removed: count,
    moved: count,
    renamed: count,
    edited: count,
    resized: count,
    linked: count
      .optional()
      .describe("Graphs only: edges added to a node that was there (it gained a parent)."),
    unlinked: count
      .optional()
      .describe("Graphs only: edges removed from a node that stays (it lost a parent)."),
  })
  .strict()
  .describe("Changed nodes per kind; each changed node counts under exactly one kind.");

/** The counts of a diff of trees: the six kinds a tree has. */
export type TreeChangeCounts = Omit<z.infer<typeof changeCountsSchema>, "linked" | "unlinked">;

export const diffFoldedSchema = foldedSchema
  .extend({
    changes: changeCountsSchema.describe("Changed nodes inside the hidden children's subtrees."),
    delta: z.number().describe("Net size change inside them (new minus old)."),
  })
  .strict()
  .describe("What is folded under a shown node, with the changes inside it.");

export const fieldEditSchema = z
  .object({
    field: z.string().describe("The compared field (--compare-field)."),
    old: z.string().describe('Its value in OLD as text ("" when the node has none).'),
    new: z.string().describe("Its value in NEW as text."),
  })
  .strict()
  .describe("A compared field whose value differs between the two versions of a matched node.");

export interface DiffSummaryNode extends NodeFields {
  change: (typeof changeKinds)[number] | null;
  delta: number;
  net: number;
  movedFrom?: string;
  renamedFrom?: string;
  edits?: z.infer<typeof fieldEditSchema>[];
  children: DiffSummaryNode[];
  hidden: z.infer<typeof diffFoldedSchema> | null;
}

export const diffNodeSchema: z.ZodType<DiffSummaryNode> = z.lazy(() =>
  z
    .object({
      ...nodeFieldsShape,
      name: nodeFieldsShape.name.describe("The node's own name (the old name for a removed node)."),
      path: nodeFieldsShape.path.describe(
        "Path in the combined tree, RFC 6901 escaping; accepted back as a focus.",
      ),
      id: nodeFieldsShape.id.describe("Row id, when nodes were matched by id."),
      interest: nodeFieldsShape.interest.describe("Degree of interest (changes score as foci do)."),
      nodes: nodeFieldsShape.nodes.describe(
        "Nodes in the combined subtree (removed ones included; 0 on a reference of a graph).",
      ),
      size: nodeFieldsShape.size.describe("Size of the subtree in the new version (removed nodes hold 0)."),
      focus: nodeFieldsShape.focus.describe("Whether the node is one of the user's foci."),
      change: z.enum(changeKinds).nullable().describe("The node's kind of change, or null."),
      delta: z.number().describe("Own size change, new minus old."),
      net: z.number().describe("Net size change of the subtree: the sum of own size changes."),
      movedFrom: z
        .string()
        .optional()
        .describe(
          "For a moved node, the old parent's path in the old version; for an unlinked full entry of a graph, the parent it lost.",
        ),
      renamedFrom: z
        .string()
        .optional()
        .describe("For a renamed node, its old name; for a moved node, its old name when it has a new one."),
      edits: z
        .array(fieldEditSchema)
        .min(1)
        .optional()
        .describe(
          "Compared fields whose value differs, in the order asked for (any kind of matched node); absent when none does.",
        ),
      children: z.array(diffNodeSchema).describe("Shown children, in the combined tree's order."),
      hidden: diffFoldedSchema.nullable().describe("Hidden children folded into counts, or null."),
    })
    .strict(),
);

const versionTotals = z
  .object({
    nodes: z.number().int().positive(),
    size: z.number(),
    empty: z
      .number()
      .int()
      .positive()
      .optional()
      .describe("Nested input: how many of the version's nodes are empty objects ({}); absent when none."),
  })
  .strict();

export const diffSchema = z
  .object({
    format: z.literal(DIFF_FORMAT),
    match: z.enum(["id", "path"]).describe("How nodes of the two versions were paired."),
    compared: z
      .array(z.string())
      .describe(
        "Record fields compared between matched nodes: a different value makes a node edited. --compare-field names them; without it, version where both versions have it. Other fields are not compared.",
      ),
    sizes: z
      .literal("values")
      .optional()
      .describe(
        "Present when the two versions are documents read as values: every size, delta and net then counts values (each scalar's text as JSON writes it, in UTF-8 bytes; an object or array nothing of its own), not the documents' bytes, as the header's \"value size\" says. Absent: sizes are the inputs' own.",
      ),
    budget: z.number().int().positive().describe("Line budget asked for."),
    lines: z
      .number()
      .int()
      .nonnegative()
      .describe("Lines the text rendering takes, the totals line included."),
    changes: changeCountsSchema.describe("Changed nodes of the whole diff, per kind."),
    totals: z
      .object({
        nodes: z
          .number()
          .int()
          .positive()
          .describe("Nodes of the combined tree: new nodes plus removed ones."),
        size: z.number().describe("Size of the new version."),
        delta: z.number().describe("Net size change: new size minus old size."),
        old: versionTotals,
        new: versionTotals,
      })
      .strict(),
    foci: z.array(z.string()).describe("Paths of the user's foci in the combined tree."),
    unmatchedFoci: unmatchedFociSchema,
    notes: z
      .array(
        readingNoteSchema
          .extend({ version: z.enum(["OLD", "NEW"]).describe("The version the note is on.") })
          .strict(),
      )
      .min(1)
      .optional()
      .describe(
        "Each version's reading notes (as a summary's input.notes), OLD's first, each also printed on standard error and said in a few words on the text header; absent when there is none.",
      ),
    root: diffNodeSchema,
  })
  .strict()
  .describe(
    "espalier diff: the changes between two versions of a hierarchy, with everything hidden counted.",
  );

export type DiffSummary = z.infer<typeof diffSchema>;
