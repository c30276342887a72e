import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Determinism across runs: each case's output, written by an earlier run into tests/golden/expected/NAME.out,
// must come out again byte for byte (a re-run inside one process would share its hash seeds, caches
// and object-key order, and so could not catch an order that depends on them). The inputs are the
// invented demo data in fixtures/. `npm run golden` rewrites the files from the current code
// (UPDATE_GOLDEN=1); a change there is a change of output, to be explained in its commit.
const DIR = "tests/golden/expected";
const ORG = ["fixtures/quillfeather-org.csv", "--parent-field", "manager", "--size-field", "cost"];
const MARCH_APRIL = [
  "fixtures/examples/org-march.csv",
  "fixtures/examples/org-april.csv",
  "--parent-field",
  "manager",
];
const PATHS = ["fixtures/examples/packages-main.paths", "fixtures/examples/packages-branch.paths"];
const KEY = { ESPALIER_PSEUDONYM_KEY: "golden-key" };

const CASES: { name: string; args: string[]; env?: Record<string, string> }[] = [
  {
    name: "summary-text",
    args: [...ORG, "--focus", "Q2417", "--focus", "Q0627", "--label", "{name}, {title}", "--budget", "24"],
  },
  { name: "summary-json", args: [...ORG, "--focus", "Q2417", "--budget", "16", "--format", "json"] },
  { name: "summary-markdown", args: [...ORG, "--focus", "Q0627", "--budget", "12", "--format", "markdown"] },
  { name: "summary-svg", args: [...ORG, "--focus", "Q2417", "--budget", "12", "--format", "svg"] },
  {
    name: "summary-pseudonymous",
    args: [...ORG, "--focus", "Q2417", "--budget", "12", "--pseudonymize"],
    env: KEY,
  },
  {
    name: "summary-path-list",
    args: ["fixtures/tidewater-files.paths", "--focus", "**/ledger", "--budget", "20"],
  },
  {
    name: "summary-graph",
    args: [
      "fixtures/tidewater-deps.edges",
      "--input-format",
      "edges",
      "--nodes",
      "fixtures/tidewater-packages.csv",
      "--focus",
      "mooring-log",
      "--budget",
      "12",
      "--units",
      "bytes",
    ],
  },
  { name: "diff-text", args: ["diff", ...MARCH_APRIL, "--budget", "12"] },
  { name: "diff-json", args: ["diff", ...MARCH_APRIL, "--format", "json"] },
  { name: "diff-path-list", args: ["diff", ...PATHS, "--budget", "10"] },
  { name: "diff-pseudonymous", args: ["diff", ...MARCH_APRIL, "--pseudonymize"], env: KEY },
];

describe("output across runs (golden files in tests/golden/expected/)", () => {
  for (const { name, args, env } of CASES) {
    it(`espalier ${args.join(" ")} prints ${DIR}/${name}.out`, async () => {
      const r = await cli(args, { env });
      expect(r.stderr).toBe("");
      expect(r.code).toBe(0);
      const file = join(DIR, `${name}.out`);
      if (process.env.UPDATE_GOLDEN === "1") writeFileSync(file, r.stdout);
      expect(existsSync(file), `${file} is missing: npm run golden writes it`).toBe(true);
      expect(r.stdout).toBe(readFileSync(file, "utf8"));
    });
  }
});
