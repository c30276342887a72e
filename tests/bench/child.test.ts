import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { csvFormat, csvParse } from "d3-dsv";
import { beforeAll, describe, expect, it } from "vitest";
import { runBin } from "../helpers/bin.js";

// bench/child.js is the benchmark's measuring process: it runs a summary or a diff step by step through
// dist/'s modules, as the command line does, and prints one JSON line. Nothing else runs it, so when it
// broke (a call without the io it needs) every bench summary and diff ended in an error and no test saw
// it. Here it runs on a tiny generated tree (400 nodes, CSV and JSON, bench/generate.js) and a second
// version with known edits; each answer must carry no error, the counts the edits imply (docs/diff.md,
// "Kinds of change") and the very text the real command line prints for the same flags (what
// bench/run.js compares it with). Nothing is timed.
const run = promisify(execFile);
const CHILD = new URL("../../bench/child.js", import.meta.url).pathname;
const BUDGET = 30;
const NODES = 400;

type Job = Record<string, unknown>;
interface Answer {
  error?: string;
  ms: number;
  check: Record<string, unknown>;
}

/** One job in a fresh process, as bench/run.js's child() starts it; the last line of its stdout. */
async function child(job: Job, env: Record<string, string> = {}): Promise<Answer> {
  let stdout: string;
  try {
    ({ stdout } = await run(process.execPath, [CHILD, JSON.stringify(job)], {
      encoding: "utf8",
      env: { PATH: process.env.PATH ?? "", ...env },
    }));
  } catch (failure) {
    // A failed job exits 1 and still prints its { error } line: keep it, so the check below names it.
    stdout = (failure as { stdout?: string }).stdout ?? "";
    if (stdout.trim() === "") throw failure;
  }
  return JSON.parse(stdout.trim().split("\n").pop() ?? "");
}

const sha1 = (text: string) => createHash("sha1").update(text).digest("hex");

interface Row {
  id: string;
  parent: string;
  name: string;
  size: string;
}

const dir = mkdtempSync(join(tmpdir(), "espalier-bench-child-"));
const files = {
  oldCsv: join(dir, "tree.csv"),
  oldJson: join(dir, "tree.json"),
  newCsv: join(dir, "tree.v2.csv"),
  newJson: join(dir, "tree.v2.json"),
};
let foci: string[] = [];
let totalSize = 0;
/** The edits, by id (ids are pre-order positions, in the CSV and in the JSON alike: bench/generate.js). */
const RESIZED_BY = 1000;
let edits: { resized: number[]; renamed: number; removed: number; addedUnder: number };
let delta = 0;

beforeAll(async () => {
  const generate = await import(new URL("../../bench/generate.js", import.meta.url).href);
  // Depth 5 at most, so that the generator finds its two deep foci in so few nodes.
  const made = generate.generate({
    nodes: NODES,
    seed: 20240611,
    maxDepth: 5,
    formats: ["json", "csv"],
    paths: { json: files.oldJson, csv: files.oldCsv },
  });
  expect(made.nodes).toBe(NODES);
  foci = made.foci;
  totalSize = made.totalSize;
  expect(foci).toHaveLength(2);

  // The second version: three leaves resized, one renamed, one removed, two added under a directory.
  const rows = csvParse(readFileSync(files.oldCsv, "utf8")) as unknown as Row[];
  const parents = new Set(rows.map((r) => r.parent));
  const leaves = rows.filter((r) => !parents.has(r.id)).map((r) => Number(r.id));
  const directories = rows.filter((r) => parents.has(r.id)).map((r) => Number(r.id));
  edits = {
    resized: [leaves[10], leaves[20], leaves[30]],
    renamed: leaves[40],
    removed: leaves[50],
    addedUnder: directories[directories.length - 1],
  };
  const byId = (id: number) => rows[id - 1];
  expect(rows.every((r, k) => Number(r.id) === k + 1)).toBe(true);
  const renamedTo = `${byId(edits.renamed).name}-v2`;
  const added = [
    { name: "added-ledger.log", size: 700 },
    { name: "added-notes.md", size: 1300 },
  ];
  // The new names are new among their siblings (else the edits would not be what the counts assume).
  const siblings = (parent: string) => rows.filter((r) => r.parent === parent).map((r) => r.name);
  expect(siblings(byId(edits.renamed).parent)).not.toContain(renamedTo);
  for (const a of added) expect(siblings(String(edits.addedUnder))).not.toContain(a.name);
  delta =
    RESIZED_BY * edits.resized.length -
    Number(byId(edits.removed).size) +
    added.reduce((sum, a) => sum + a.size, 0);

  const newRows: Row[] = [];
  for (const r of rows) {
    const id = Number(r.id);
    if (id === edits.removed) continue;
    if (edits.resized.includes(id)) newRows.push({ ...r, size: String(Number(r.size) + RESIZED_BY) });
    else if (id === edits.renamed) newRows.push({ ...r, name: renamedTo });
    else newRows.push(r);
  }
  for (const [k, a] of added.entries()) {
    newRows.push({
      id: String(NODES + 1 + k),
      parent: String(edits.addedUnder),
      name: a.name,
      size: String(a.size),
    });
  }
  writeFileSync(files.newCsv, `${csvFormat(newRows, ["id", "parent", "name", "size"])}\n`);

  interface JsonNode {
    name: string;
    size: number;
    children?: JsonNode[];
  }
  const root = JSON.parse(readFileSync(files.oldJson, "utf8")) as JsonNode;
  // Walk in pre-order, numbering as the generator did, and edit the same nodes.
  let next = 1;
  const edit = (node: JsonNode): JsonNode | undefined => {
    const id = next++;
    const kids = node.children?.map(edit).filter((k): k is JsonNode => k !== undefined);
    if (id === edits.removed) return undefined;
    const out: JsonNode = { ...node, ...(kids ? { children: kids } : {}) };
    if (edits.resized.includes(id)) out.size += RESIZED_BY;
    if (id === edits.renamed) out.name = renamedTo;
    if (id === edits.addedUnder) out.children = [...(out.children ?? []), ...added];
    return out;
  };
  writeFileSync(files.newJson, `${JSON.stringify(edit(root))}\n`);
  expect(next - 1).toBe(NODES);
});

describe("bench/child.js on a 400-node tree", () => {
  for (const format of ["csv", "json"] as const) {
    const file = () => (format === "csv" ? files.oldCsv : files.oldJson);

    it(`${format}: the summary jobs ('full', streamed; 'memory') report the tree and print what the command line prints`, async () => {
      const job = { format, file: file(), foci, budget: BUDGET };
      const [streamed, inMemory, cli] = await Promise.all([
        child({ kind: "full", ...job }),
        child({ kind: "memory", ...job }),
        runBin([file(), ...foci.flatMap((f) => ["--focus", f]), "--budget", String(BUDGET)]),
      ]);
      expect(cli.stderr).toBe("");
      expect(cli.code).toBe(0);
      for (const answer of [streamed, inMemory]) {
        expect(answer.error).toBeUndefined();
        expect(answer.check.nodes).toBe(NODES);
        // The root's total is the sum of every node's own size, as the generator wrote them.
        expect(answer.check.size).toBe(totalSize);
        expect(answer.check.lines).toBeGreaterThan(2);
        expect(answer.check.lines).toBeLessThanOrEqual(BUDGET);
        expect(answer.check.output).toBe(sha1(cli.stdout));
      }
    });

    for (const threads of ["1", "2"]) {
      it(`${format}: the diff job loading on ${threads} thread(s) counts the edits and prints what the command line prints`, async () => {
        const oldFile = file();
        const newFile = format === "csv" ? files.newCsv : files.newJson;
        const [answer, cli] = await Promise.all([
          child(
            { kind: "diff", format, oldFile, newFile, budget: BUDGET },
            { ESPALIER_LOAD_THREADS: threads },
          ),
          runBin(["diff", oldFile, newFile, "--budget", String(BUDGET)], {
            env: { ESPALIER_LOAD_THREADS: threads },
          }),
        ]);
        expect(answer.error).toBeUndefined();
        expect((answer as Answer & { threads: number }).threads).toBe(Number(threads));
        expect(answer.check.oldNodes).toBe(NODES);
        expect(answer.check.newNodes).toBe(NODES + 1);
        // docs/diff.md, Kinds of change: matched by id (CSV) a rename is `renamed`; matched by path (JSON)
        // the renamed node is one removed and one added. Resized: a node's own size changed.
        expect(answer.check.by).toBe(format === "csv" ? "id" : "path");
        const expected =
          format === "csv"
            ? { added: 2, removed: 1, moved: 0, renamed: 1, edited: 0, resized: 3 }
            : { added: 3, removed: 2, moved: 0, renamed: 0, edited: 0, resized: 3 };
        expect(answer.check.changes).toMatchObject(expected);
        expect(answer.check.delta).toBe(delta);
        expect(answer.check.lines).toBeLessThanOrEqual(BUDGET);
        expect(cli.stderr).toBe("");
        expect(cli.code).toBe(0);
        expect(answer.check.head).toBe(cli.stdout.slice(0, cli.stdout.indexOf("\n")));
        expect(answer.check.output).toBe(sha1(cli.stdout));
      });
    }
  }
});
