import * as z from "zod";
import { readingNoteCodes } from "../model/reading-note.js";

/** Name and version of the summary JSON; bump the number when a field changes meaning. */
export const SUMMARY_FORMAT = "espalier-summary/1";

export const foldedSchema = z
  .object({
    children: z.number().int().nonnegative().describe("Hidden children of this node."),
    nodes: z.number().int().nonnegative().describe("Nodes in the hidden children's subtrees."),
    size: z.number().describe("Size in the hidden children's subtrees."),
    references: z
      .number()
      .int()
      .nonnegative()
      .optional()
      .describe("Graphs only: reference lines among what is folded (they count no node)."),
    empty: z
      .number()
      .int()
      .nonnegative()
      .optional()
      .describe("Nested input with empty entries ({}): how many of the hidden nodes are such."),
  })
  .describe("What is folded under a shown node.");

/** The fields every node of the summary and the diff JSON has, besides its children and fold. */
export interface NodeFields {
  name: string;
  path: string;
  id?: string;
  label?: string;
  interest: number;
  nodes: number;
  size: number;
  focus: boolean;
  reference?: { path: string; cycle: boolean };
  parents?: { count: number; hidden: number };
  empty?: true;
}

/** The schemas of {@link NodeFields}, with their meaning in a summary (a diff re-describes some). */
export const nodeFieldsShape = {
  name: z
    .string()
    .describe(
      "The node's own name, as in the input; a root espalier adds, and a lone top node without a name, take the input file's base name ((stdin) from standard input).",
    ),
  path: z.string().describe("Path from below the root, RFC 6901 escaping; accepted back as a focus."),
  id: z.string().optional().describe("Row id, when the input links rows by id."),
  label: z.string().optional().describe("Display text, when a label template is in use."),
  interest: z.number().describe("Degree of interest (0 on focus paths, lower is less interesting)."),
  nodes: z
    .number()
    .int()
    .nonnegative()
    .describe("Nodes in the subtree, this node included (distinct nodes; 0 on a reference)."),
  size: z.number().describe("Size of the subtree, this node included (0 without sizes)."),
  focus: z.boolean().describe("Whether the node is a focus."),
  reference: z
    .object({
      path: z.string().describe("Path of the node's full entry; accepted back as a focus."),
      cycle: z.boolean().describe("Whether the full entry is an ancestor of this line (a cycle)."),
    })
    .strict()
    .optional()
    .describe("Graphs only: this line stands for a node whose full entry is elsewhere."),
  parents: z
    .object({
      count: z.number().int().positive().describe("Parents of the focus in the graph."),
      hidden: z.number().int().nonnegative().describe("Those not shown."),
    })
    .strict()
    .optional()
    .describe("Graphs only, on a focus with several parents."),
  empty: z
    .literal(true)
    .optional()
    .describe(
      "Nested input: the node's object had no field at all ({}), as npm ls --json lists a dependency it did not install; it counts as a node.",
    ),
};

export interface SummaryNode extends NodeFields {
  children: SummaryNode[];
  hidden: z.infer<typeof foldedSchema> | null;
}

export const summaryNodeSchema: z.ZodType<SummaryNode> = z.lazy(() =>
  z
    .object({
      ...nodeFieldsShape,
      children: z.array(summaryNodeSchema).describe("Shown children, in input order."),
      hidden: foldedSchema.nullable().describe("Hidden children folded into counts, or null."),
    })
    .strict(),
);

/** How the input was read (src/model/tree.ts TreeReading). */
/** One reading note as printed (model/reading-note.ts): in a summary's `input.notes` and a diff's `notes`. */
export const readingNoteSchema = z
  .object({
    code: z
      .enum(readingNoteCodes)
      .describe(
        "What was noticed. FIRST_LINE_APART: an edge list's first line was read as an edge that shares no node with any other line, as a header naming the columns would be. COMMAS_READ_AS_PATHS: two lines with as many commas (a CSV table's header and one row) were read as two paths. READ_AS_OTHER (a diff's version): read as the other version was, although on its own it reads another way. ROOT_IS_FOLDER (a diff's path list): compared from the folder it names down, as the other version lists that folder's contents without its name, or names it at another path; count: the folders above it left out (0: its top folder was compared as the root). SIZES_LEFT_OUT (a diff's version): its sizes were left out, as the other version has none. REPEATED_KEY: a key repeated in a JSON object of children by name (or a node's children field given twice), or an id repeated in a JSON adjacency map (--graph): as JSON.parse does, the last value was read and the nodes or links of the earlier ones were not; count: how many repeats, line: the first. UNSIZED_IMPORTANCE: --importance size was asked for and the input has no sizes, so nodes rank as with --importance depth. MISSING_ENTRIES: node objects hold \"missing\": true, as npm ls --all --json lists a dependency it did not find; each is counted as a node, in every total; count: how many. DEDUPED_ENTRIES: node objects hold a version and no \"overridden\", beside others that hold one, as npm ls --all --json lists a package again (deduped) under each package that requires it, its dependencies under its full entry only; each is counted as a node, a leaf, in every total; count: how many. ALIASES_AS_TEXT: YAML read as values holds aliases (*name), each a leaf of its own text: the value an alias names is counted once, at its anchor, not where the alias stands; count: how many aliases. SIZES_LIKE_TOTALS: every node with children (in a path list, every listed folder) is at least as big as its children add up to, as sizes that include the children's are (lsblk -J -b, du -ab), and they were read as each node's own (--folder-sizes total reads them as totals). TOTAL_LINE_LEFT_OUT: a path list's last line SIZE<TAB>total (or total in another language du prints) gave what the other lines add up to, as du -c ends its listing, and was left out. LAST_LINE_LIKE_TOTAL: a path list's last line named a top-level entry, in a word not known as du's total, whose size is what the other lines add up to, and was read as an entry. IDS_RENUMBERED (a diff's NEW version): matched by id, most removed nodes have an added node of the same name under the same parent, or most nodes moved or renamed have a node of the same name under the same parent in the other version that another id named, as renumbered ids do; count: how many pair so. NODES_NOT_READ: node objects (objects holding the name, size or children field) sit in a field of a node object that is not read, as a second list beside the children field's; they are in no total; count: how many, at any depth of those fields. UNDECODABLE_BYTES: lines of a path list or a YAML document, rows of a table (a graph's too), ids of an edge list, or strings of a JSON document hold bytes that are not UTF-8, each bad sequence read as U+FFFD (names that differ only there print alike); count: how many, line: the first. ABSOLUTE_AND_RELATIVE: a path list names paths from / and paths that start elsewhere, read as two trees side by side (/ and the relative paths' top folders); line: the first of either. SBOM_DEPENDENCIES: a CycloneDX document (\"bomFormat\": \"CycloneDX\") was read as its dependency graph, one node per component named by its name, its version a field, not as its values (--read-as values reads those). UNIT_NOT_SAID: a path list whose sizes show no unit was read as bytes: one folder's entries (du -sb DIR/*, a package inventory), or fewer than 8 sizes, and no folder's own size a directory's bytes; du -s --apparent-size DIR/* and dpkg-query's Installed-Size give KiB, du -a and find -printf '%k' blocks (--units bytes or plain says it instead); count: the entries, or the sizes. SAVED_VIEW: the input is espalier's own summary JSON (\"format\": \"espalier-summary/1\"), read as the view it holds: each shown node a node, and each fold one entry named (folded) that stands for the nodes and size it hides, so every total is the saved one; count: the folds. COMPARED_AT_FOLDS (a diff's version): it shows nodes inside folds of the other version, a saved view that folds more (saved with a smaller budget or another focus), and no node the other shows is in a fold of its own, so it was compared at the other's folds: under each, its children the other does not show and its own fold there were counted as one fold entry, compared as a whole; count: the folds.",
      ),
    line: z.number().int().positive().optional().describe("The input line the note is about."),
    count: z
      .number()
      .int()
      .nonnegative()
      .optional()
      .describe(
        "How many things the note is about, where it counts them (the code's description says what), as the text header says it; absent where the note counts nothing.",
      ),
    message: z
      .string()
      .describe("The note as standard error prints it: what was read, why, and how to read it otherwise."),
  })
  .strict();

export const inputReadingSchema = z
  .object({
    shape: z
      .enum(["nodes", "values", "path-map", "rows", "table", "paths", "graph"])
      .describe(
        "nodes: node objects; values: every value of a JSON/YAML document; path-map: an object keyed by path; rows: JSON rows; table: CSV/TSV or a fact table; paths: a path list; graph: nodes and edges (edge list or table, adjacency map, a table read as a graph).",
      ),
    sizeUnit: z.enum(["bytes", "number"]).describe("What sizes count: bytes, or plain numbers."),
    childrenField: z.string().optional().describe("Nested input: the field children were read from."),
    childrenFieldFound: z
      .boolean()
      .optional()
      .describe("Whether espalier chose childrenField because the configured field was absent."),
    pathMapField: z.string().optional().describe("A map keyed by path: the field holding it."),
    folderTotals: z
      .boolean()
      .optional()
      .describe(
        "A path list whose folder lines gave each folder with its contents (as du -ab prints them); own sizes are those totals minus the contents'.",
      ),
    startAt: z
      .string()
      .optional()
      .describe(
        "JSON/YAML read from one part of the document (--start-at): the JSON Pointer (RFC 6901) of that part; absent when the whole document was read.",
      ),
    unnamed: z
      .string()
      .optional()
      .describe(
        'Nested input none of whose nodes has the name field (this field, name by default) nor is keyed by name below the top: every node is named "" (the header says so; --name-field names the field that holds names).',
      ),
    rootIsStart: z
      .boolean()
      .optional()
      .describe(
        "A path list whose root stands for the listed folder whatever it is named: a line with an empty path named it (find DIR -printf '%P'), or every path starts with . (find .). A diff compares such a root with the other version's root.",
      ),
    rootNamed: z
      .enum(["added", "nameless"])
      .optional()
      .describe(
        "The root's name is espalier's, not the input's: added, a root espalier put above the input's top-level nodes (a path list's, a table's, an array's); nameless, the input's one top node had no name and was named after the input. A diff of two saved summaries compares two such roots, each named after its own file, as one root, as a diff of the inputs does.",
      ),
    emptyEntries: z
      .number()
      .int()
      .positive()
      .optional()
      .describe(
        "Nested input: how many nodes are empty objects ({}), counted in totals.nodes; absent when none.",
      ),
    rolledUpRows: z
      .number()
      .int()
      .positive()
      .optional()
      .describe(
        "A fact table (--levels, --key-field, --rolled-up): how many of its rows the nodes stand for (several rows may fall on one node); totals.nodes counts nodes, not rows.",
      ),
    filledRows: z
      .number()
      .int()
      .positive()
      .optional()
      .describe(
        "A CSV/TSV table read with --short-rows fill: how many short rows had their missing last fields read as empty; absent when none.",
      ),
    documents: z
      .number()
      .int()
      .min(2)
      .optional()
      .describe(
        "A YAML stream of several documents read as values: how many; each is a child of the root named by its index (0, 1, ...). Absent for one document.",
      ),
    namesFrom: z
      .string()
      .optional()
      .describe(
        "A table or rows linked by id without the name column (--name-field): the id column, whose values name the nodes. Absent when names come from the name column.",
      ),
    linkedBy: z
      .array(z.string())
      .min(1)
      .max(2)
      .optional()
      .describe(
        "A table or rows (not a graph): the fields that link the rows into a tree, the id and parent fields, or the path field.",
      ),
    notes: z
      .array(readingNoteSchema)
      .min(1)
      .optional()
      .describe(
        "What the reader should know about this reading that the tree cannot show (each also printed on standard error, and said in a few words on the text header); absent when there is none.",
      ),
  })
  .strict()
  .describe("How the input was read.");

/** The foci left out, in a summary and in a diff alike. */
export const unmatchedFociSchema = z
  .array(z.string())
  .min(1)
  .optional()
  .describe(
    "Foci that matched no node and were left out (--unmatched-foci skip), as given (pseudonymous under --pseudonymize); absent when every focus matched.",
  );

export const summarySchema = z
  .object({
    format: z.literal(SUMMARY_FORMAT),
    budget: z.number().int().positive().describe("Line budget asked for."),
    lines: z.number().int().nonnegative().describe("Lines the text rendering of this selection takes."),
    totals: z.object({ nodes: z.number().int().positive(), size: z.number() }).strict(),
    foci: z.array(z.string()).describe("Paths of the focus nodes."),
    unmatchedFoci: unmatchedFociSchema,
    input: inputReadingSchema.optional(),
    root: summaryNodeSchema,
  })
  .strict()
  .describe("espalier summary: the shown part of a hierarchy, with everything hidden counted.");

export type Summary = z.infer<typeof summarySchema>;
