#!/usr/bin/env node
// Reads espalier's screens as a reader without the docs would, on real inputs at many widths and
// budgets, and reports every line whose numbers do not add up, every mark the screen does not
// explain, and every screen over its budget or width.
//
// Usage (after `npm run build`): node tests/screens/check-screens.mjs [--quick]
// Inputs it makes for itself under a temporary folder: `npm ls --all --json` of this project and an
// edited copy (for a diff), and `find /usr/share -printf '%s\t%P\n'`; plus YAML files already on the
// machine and the invented fixtures. The rule it checks (docs/selection.md): on every line,
// nodes = the line's names + the nodes of the lines below it + what its fold hides.
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import stringWidth from "string-width";
import { run } from "../../dist/cli/main.js";

const repo = fileURLToPath(new URL("../..", import.meta.url));
const quick = process.argv.includes("--quick");

/** Runs the CLI in-process, with `env` as its whole environment. */
async function cli(args, env = {}) {
  let stdout = "";
  let stderr = "";
  const code = await run(args, {
    stdout: {
      write: (s) => {
        stdout += s;
        return true;
      },
      isTTY: false,
    },
    stderr: {
      write: (s) => {
        stderr += s;
        return true;
      },
    },
    readStdin: async () => Buffer.alloc(0),
    readFile: (p) => Promise.resolve(readFileSync(p)),
    env,
  });
  return { code, stdout, stderr };
}

// --- the inputs ---------------------------------------------------------------------------------
const work = mkdtempSync(join(tmpdir(), "espalier-screens-"));

function npmListing() {
  const out = join(work, "npm-ls.json");
  let text;
  try {
    text = execFileSync("npm", ["ls", "--all", "--json"], { cwd: repo, maxBuffer: 1 << 28 }).toString();
  } catch (err) {
    // npm ls exits 1 on an extraneous or missing package but still prints the listing.
    text = err.stdout?.toString() ?? "";
  }
  writeFileSync(out, text);
  // An edited copy: some versions changed, some packages gone, one added (a fictional one).
  const tree = JSON.parse(text);
  let n = 0;
  const walk = (node) => {
    for (const [name, dep] of Object.entries(node.dependencies ?? {})) {
      n++;
      if (n % 29 === 0) dep.version = `${dep.version ?? "0"}-next`;
      if (n % 97 === 0) delete node.dependencies[name];
      else walk(dep);
    }
  };
  walk(tree);
  tree.dependencies ??= {};
  tree.dependencies["tidewater-gauge"] = { version: "1.0.0", dependencies: { "tidewater-core": {} } };
  const edited = join(work, "npm-ls-edited.json");
  writeFileSync(edited, JSON.stringify(tree, null, 2));
  return [out, edited];
}

function findListing() {
  const out = join(work, "share.tsv");
  const text = execFileSync("find", ["/usr/share", "-printf", "%s\\t%P\\n"], {
    maxBuffer: 1 << 30,
    stdio: ["ignore", "pipe", "ignore"],
  }).toString();
  writeFileSync(out, text);
  // An edited copy for a diff: every 13th file resized, every 150th gone, a few new ones.
  const edited = text
    .split("\n")
    .filter((l, k) => l !== "" && k % 150 !== 7)
    .map((l, k) => (k % 13 === 5 ? l.replace(/^([0-9]+)/, (n) => String(Number(n) + 100)) : l));
  edited.push("4096\tdoc/tidewater-gauge/README", "812\tdoc/tidewater-gauge/copyright");
  writeFileSync(join(work, "share-edited.tsv"), `${edited.join("\n")}\n`);
  // The deepest path, and one of medium depth, as foci.
  const paths = text.split("\n").map((l) => l.split("\t")[1] ?? "");
  const deep = paths.reduce((a, b) => (b.split("/").length > a.split("/").length ? b : a), "");
  const mid = paths.find((p) => p.split("/").length === 4) ?? "";
  return { file: out, edited: join(work, "share-edited.tsv"), deep: escapePath(deep), mid: escapePath(mid) };
}

/** A listed path as a focus: `~` and `/` inside a name are escaped as in RFC 6901 (none inside here). */
function escapePath(p) {
  return p
    .split("/")
    .map((s) => s.replaceAll("~", "~0"))
    .join("/");
}

function yamlOnMachine() {
  const found = execFileSync(
    "sh",
    ["-c", "find /usr/lib /usr/share /etc -name '*.yaml' -size +20k 2>/dev/null | sort | head -3"],
    { maxBuffer: 1 << 20 },
  )
    .toString()
    .split("\n")
    .filter(Boolean);
  return found;
}

// --- reading a screen ---------------------------------------------------------------------------
const ANSI = /\u001b\[[0-9;]*m/g;

/** The names a label stands for: a chain's `a / b` is two; `(k more)` is k. */
function namesIn(label) {
  return label
    .split(" / ")
    .map((name) => /^\(([0-9,]+) more\)$/.exec(name))
    .reduce((sum, more) => sum + (more ? num(more[1]) : 1), 0);
}

const num = (s) => Number(s.replaceAll(",", ""));

/** A tree line: its level, mark, names, count (NaN for `?`), fold count (NaN for a bare `(hidden)`). */
function readLine(line) {
  const m = /^( *)(?:([0-9]+) )?([*:.&]) (.*)$/.exec(line);
  if (!m) return null;
  const [, indent, digits, mark, rest] = m;
  const parts = rest.split("  ");
  let label = parts[0];
  // A diff's change tag before the name: `[edited version 1 -> 2] name`.
  label = label.replace(/^\[[^\]]*\] ?/, "");
  const numbers = parts.slice(1).find((p) => !p.startsWith("(")) ?? "";
  const fold = parts.slice(1).find((p) => /^\((hidden|[0-9,]+ hidden)/.test(p)) ?? "";
  let nodes = 1;
  if (numbers === "?") nodes = Number.NaN;
  else {
    const c = /^([0-9,]+) nodes?\b/.exec(numbers);
    if (c) nodes = num(c[1]);
  }
  let hidden = 0;
  if (fold === "(hidden)") hidden = Number.NaN;
  else if (fold) {
    const f =
      /^\(hidden: (?:[0-9,]+ child(?:ren)?, )?([0-9,]+) nodes?/.exec(fold) ??
      /^\(([0-9,]+) hidden/.exec(fold);
    if (!f) return { bad: `fold not read: ${fold}` };
    hidden = num(f[1]);
  }
  const shownSize = /^[0-9,]+ nodes?, |^[0-9.,]+ ?[KMGTP]?i?B$|^[0-9.,]+[kMGTP]?$/.test(numbers);
  return {
    level: digits === undefined ? indent.length / 2 : Number(digits),
    digits: digits !== undefined,
    mark,
    label: parts[0],
    names: mark === "&" ? 1 : namesIn(label),
    nodes: mark === "&" ? 0 : nodes,
    hidden,
    shownSize,
    numbers,
    sizeCut: numbers.includes("size cut"),
  };
}

/** The problems of one text screen (header and key first, then the tree's lines). */
function checkText(text, { budget, width, legend, key = true, kind = "summary" }) {
  const problems = [];
  const all = text.replace(ANSI, "").trimEnd().split("\n");
  if (all.length > budget) problems.push(`${all.length} lines for a budget of ${budget}`);
  if (width !== undefined)
    for (const l of all) if (stringWidth(l) > width) problems.push(`wider than ${width}: ${l}`);
  // The tree starts at the first line that opens with a mark at column 0 (the root's).
  const start = all.findIndex((l) => /^[*:.&] /.test(l));
  if (start < 0) return [`no root line:\n${text}`];
  const head = all.slice(0, start).join("\n");
  const lines = all.slice(start).map(readLine);
  lines.forEach((l, k) => {
    if (l === null) problems.push(`not a tree line: ${all[start + k]}`);
    else if (l.bad) problems.push(`${l.bad}: ${all[start + k]}`);
  });
  if (problems.length > 0) return problems;
  // nodes = names + the lines below + hidden, on every line (a reference carries no count).
  for (let k = 0; k < lines.length; k++) {
    if (lines[k].mark === "&") continue;
    let below = 0;
    for (let j = k + 1; j < lines.length && lines[j].level > lines[k].level; j++)
      if (lines[j].level === lines[k].level + 1) below += lines[j].nodes;
    const l = lines[k];
    if (Number.isNaN(l.nodes) || Number.isNaN(below)) continue;
    if (Number.isNaN(l.hidden)) {
      if (!(l.nodes > l.names + below)) problems.push(`a bare fold hides nothing: ${all[start + k]}`);
      continue;
    }
    if (l.nodes !== l.names + below + l.hidden)
      problems.push(`${l.nodes} != ${l.names} + ${below} + ${l.hidden}: ${all[start + k]}`);
  }
  // The root's count is the header's total (a summary's).
  const total = /^summary: ([0-9,]+) nodes/.exec(all[0] ?? "");
  if (total && !Number.isNaN(lines[0].nodes) && lines[0].nodes !== num(total[1]))
    problems.push(`root ${lines[0].nodes} != header ${total[1]}`);
  if (legend || !key) return problems;
  // A budget with no room for the key beside the root and the focus paths: the header says so.
  if (/key left out: |no key: --budget /.test(head.replaceAll("\n  ", " "))) {
    noted++;
    return problems;
  }
  if (!/(^|; )key: /m.test(head)) {
    problems.push("no key, and nothing says it was left out");
    return problems;
  }
  // Every mark and cut on the lines is explained above them.
  const says = (w) => head.includes(w);
  const need = (cond, word, what) => {
    if (cond && !says(word)) problems.push(`${what} not explained`);
  };
  const marks = new Set(lines.map((l) => l.mark));
  for (const m of marks) need(true, `'${m}'`, `mark '${m}'`);
  need(
    lines.some((l) => Number.isNaN(l.nodes)),
    "'?'",
    "'?'",
  );
  need(
    lines.some((l) => Number.isNaN(l.hidden)),
    "(hidden)",
    "a bare '(hidden)'",
  );
  if (lines.some((l) => l.digits) && !/depth|levels? down/.test(head))
    problems.push("a level in digits not explained");
  need(
    lines.some((l) => / \/ \([0-9,]+ more\) \/ /.test(l.label)),
    "more)",
    "'(k more)'",
  );
  need(
    lines.some((l) => l.label.includes("…")),
    "'…'",
    "a cut name '…'",
  );
  need(
    lines.some((l) => l.sizeCut),
    "size cut'",
    "'size cut'",
  );
  need(
    lines.some((l) => l.label.includes(" / ") && !l.label.startsWith("[")),
    "a / b",
    "a chain 'a / b'",
  );
  // The header states a size but no line shows one: the key says the sizes were left out.
  const headSize = kind === "summary" && /^summary: [0-9,]+ nodes, /.test(all[0]);
  if (headSize && lines.every((l) => !l.shownSize) && !/sizes cut|sizes left out/.test(head))
    problems.push("sizes left out, not said");
  return problems;
}

/** Every node of a summary's JSON: nodes = 1 + its children's + hidden. */
function checkJson(text, budget) {
  const problems = [];
  const doc = JSON.parse(text);
  if (doc.lines > budget) problems.push(`json lines ${doc.lines} > budget ${budget}`);
  const walk = (n) => {
    // A reference (graphs) carries no count: its node is counted at its full entry.
    if (n.reference) {
      if (n.nodes !== 0) problems.push(`json ${n.path}: a reference counts ${n.nodes}`);
      return;
    }
    const below = (n.children ?? []).reduce((s, c) => s + c.nodes, 0);
    const hidden = n.hidden?.nodes ?? 0;
    if (n.nodes !== 1 + below + hidden)
      problems.push(`json ${n.path}: ${n.nodes} != 1 + ${below} + ${hidden}`);
    for (const c of n.children ?? []) walk(c);
  };
  walk(doc.root);
  return problems;
}

// --- the runs -----------------------------------------------------------------------------------
const [npmLs, npmLsEdited] = npmListing();
const share = findListing();
const yamls = yamlOnMachine();
const fixtures = join(repo, "fixtures");

const cases = [
  { name: "npm ls", args: [npmLs] },
  { name: "npm ls, focus", args: [npmLs, "--focus", "**/vitest"] },
  { name: "npm ls diff", args: ["diff", npmLs, npmLsEdited], kind: "diff" },
  { name: "find /usr/share", args: [share.file] },
  { name: "find /usr/share, deep focus", args: [share.file, "--focus", share.deep] },
  {
    name: "find /usr/share, deep focus, no chains",
    args: [share.file, "--focus", share.deep, "--no-chains"],
  },
  { name: "find /usr/share, two foci", args: [share.file, "--focus", share.deep, "--focus", share.mid] },
  { name: "find /usr/share diff", args: ["diff", share.file, share.edited], kind: "diff" },
  {
    name: "find /usr/share diff, focus",
    args: ["diff", share.file, share.edited, "--focus", share.mid],
    kind: "diff",
  },
  ...yamls.map((y) => ({ name: `yaml ${y}`, args: [y] })),
  {
    name: "org chart",
    args: [
      join(fixtures, "quillfeather-org.csv"),
      "--parent-field",
      "manager",
      "--size-field",
      "cost",
      "--focus",
      "Q2417",
    ],
  },
  {
    name: "deps graph",
    args: [
      join(fixtures, "tidewater-deps.edges"),
      "--input-format",
      "edges",
      "--nodes",
      join(fixtures, "tidewater-packages.csv"),
      "--focus",
      "mooring-log",
    ],
  },
];
if (existsSync(join(fixtures, "quillfeather-org-last-week.csv")))
  cases.push({
    name: "org diff",
    args: [
      "diff",
      join(fixtures, "quillfeather-org-last-week.csv"),
      join(fixtures, "quillfeather-org.csv"),
      "--parent-field",
      "manager",
    ],
    kind: "diff",
  });

const widths = quick ? [32, 60, undefined] : [30, 32, 40, 60, 80, 120, undefined];
const budgets = quick ? [10, 20] : [6, 8, 10, 14, 20, 40];
let screens = 0;
let noted = 0;
let failed = 0;
let refused = 0;
for (const c of cases) {
  for (const width of widths) {
    for (const budget of budgets) {
      for (const legend of [false, true]) {
        if (legend && budget < 40) continue;
        const args = [...c.args, "--budget", String(budget), ...(legend ? ["--legend"] : [])];
        const env = width === undefined ? { NO_COLOR: "1" } : { COLUMNS: String(width), NO_COLOR: "1" };
        const r = await cli(args, env);
        const what = `${c.name} | COLUMNS=${width ?? "-"} ${args.slice(c.args.length).join(" ")}`;
        if (r.code === 2 && /BUDGET_TOO_SMALL/.test(r.stderr)) {
          refused++;
          // The smallest budget it names must work.
          const smallest = Number(/smallest budget that works is ([0-9]+)/.exec(r.stderr)?.[1]);
          const again = await cli(
            [...c.args, "--budget", String(smallest), ...(legend ? ["--legend"] : [])],
            env,
          );
          if (again.code !== 0) {
            failed++;
            console.log(`FAIL ${what}\n  says ${smallest} works, but: ${again.stderr.trim()}`);
          }
          if (smallest > 1) {
            const below = await cli(
              [...c.args, "--budget", String(smallest - 1), ...(legend ? ["--legend"] : [])],
              env,
            );
            if (below.code === 0) {
              failed++;
              console.log(`FAIL ${what}\n  says ${smallest} is the smallest, but ${smallest - 1} works`);
            }
          }
          continue;
        }
        if (r.code !== 0) {
          failed++;
          console.log(`FAIL ${what}\n  exit ${r.code}: ${r.stderr.trim()}`);
          continue;
        }
        screens++;
        const problems = checkText(r.stdout, { budget, width, legend, kind: c.kind });
        // Colour changes nothing but the escapes.
        if (!legend && budget === budgets[0]) {
          const coloured = await cli(
            [...args, "--color", "always"],
            width === undefined ? {} : { COLUMNS: String(width) },
          );
          if (coloured.stdout.replace(ANSI, "") !== r.stdout)
            problems.push("coloured text differs from plain");
        }
        if (width === undefined && !legend && c.kind !== "diff") {
          const json = await cli([...args, "--format", "json"], env);
          problems.push(...checkJson(json.stdout, budget));
        }
        if (problems.length > 0) {
          failed++;
          console.log(`FAIL ${what}\n  ${problems.join("\n  ")}\n${r.stdout.replace(/^/gm, "  | ")}`);
        }
      }
    }
  }
}
console.log(
  `${screens} screens read (${noted} saying the key was left out), ${refused} budgets refused (each checked), ${failed} failed`,
);
process.exitCode = failed > 0 ? 1 : 0;
