#!/usr/bin/env node
// Reads espalier's screens as a reader without the docs would, on real inputs at many widths and
// budgets, and reports every line whose numbers do not add up, every mark the screen does not
// explain, and every screen over its budget or width.
//
// Usage (after `npm run build`): [CHECK_SCREENS_DIST=DIR] node tests/screens/check-screens.mjs [--quick | --views]
// It also compares each budget's screen with the next budget's: the larger shows every node the
// smaller does (docs/selection.md, guarantee 2), the key's rows included.
// Inputs it makes for itself under a temporary folder: `npm ls --all --json` of this project and an
// edited copy (for a diff), and `find /usr/share -printf '%s\t%P\n'`; plus YAML files already on the
// machine and the invented fixtures; and the interactive view's first screens of some of them. The
// rule it checks (docs/selection.md): on every line,
// nodes = the line's names + the nodes of the lines below it + what its fold hides.
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import stringWidth from "string-width";
import { ANSI, checkJson, checkText } from "./read-screen.mjs";

const repo = fileURLToPath(new URL("../..", import.meta.url));
// CHECK_SCREENS_DIST=/path/to/other/dist reads another build's screens on the same inputs (a before
// and after); by default this checkout's build.
const dist = process.env.CHECK_SCREENS_DIST ?? join(repo, "dist");
const { run } = await import(join(dist, "cli/main.js"));
const quick = process.argv.includes("--quick");
// --views: the interactive view's screens only (all its sizes), not the printed ones.
const viewsOnly = process.argv.includes("--views");

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
    graph: true,
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
// Org charts hold personal data: under --pseudonymize no screen, nor its standard error, names a
// person of the input (its `name` column), however the lines are cut.
const secret = { ESPALIER_PSEUDONYM_KEY: "check-screens, not a secret" };
const orgCsv = join(fixtures, "quillfeather-org.csv");
cases.push(
  {
    name: "org chart, pseudonymized",
    args: [orgCsv, "--parent-field", "manager", "--size-field", "cost", "--focus", "Q2417", "--pseudonymize"],
    env: secret,
    people: orgCsv,
  },
  {
    name: "org diff, pseudonymized",
    args: [
      "diff",
      join(fixtures, "examples", "org-march.csv"),
      join(fixtures, "examples", "org-april.csv"),
      "--parent-field",
      "manager",
      "--pseudonymize",
    ],
    kind: "diff",
    env: secret,
    people: join(fixtures, "examples", "org-april.csv"),
  },
);
/** The `name` column's values of a CSV fixture (no quoted commas in these), each a person. */
function peopleIn(file) {
  const [head, ...rows] = readFileSync(file, "utf8").trimEnd().split("\n");
  const at = head.split(",").indexOf("name");
  return rows.map((r) => r.split(",")[at]).filter((n) => n && n.length > 2);
}
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

// --- inputs read with a note ---------------------------------------------------------------------
// Invented inputs, each read with a note (docs/input.md) the header says in a few words, and the
// CycloneDX SBOMs found on the machine (ECMA-424) with an edited copy: `says` is what the header must
// hold whole however it wraps (a clause cut or split off reads wrong), `unsaid` what it must not.
function notedInputs() {
  const dir = join(work, "noted");
  mkdirSync(dir);
  const at = (name, text) => {
    writeFileSync(join(dir, name), text);
    return join(dir, name);
  };
  const out = [];
  // NODES_NOT_READ: node objects beside the children field of an invented harbour's services.
  const service = (name, size, children) => ({ name, size, ...(children ? { children } : {}) });
  const notRead = {
    ...service("tidewater", 0, [
      service("harbour-ledger", 1200, [service("reconcile", 300), service("export", 250)]),
      service("mooring-log", 800, [
        { ...service("archive", 120), retired: [service("old-buoys", 40), service("old-chains", 30)] },
      ]),
      service("quayside-dashboards", 950),
    ]),
    attic: [service("brackwater-models", 500, [service("tides-v1", 90)])],
  };
  out.push({
    name: "node objects not read",
    args: [at("not-read.json", JSON.stringify(notRead))],
    says: /4 node objects outside the children not read/,
  });
  // UNDECODABLE_BYTES: a path list with Latin-1 bytes in two names.
  const latin = Buffer.concat([
    Buffer.from("4096\tservices/harbour-ledger/README\n2048\tservices/harbour-ledger/caf"),
    Buffer.from([0xe9]),
    Buffer.from("-menu.txt\n512\tservices/mooring-log/"),
    Buffer.from([0xff, 0xfe]),
    Buffer.from("index.ts\n300\tservices/mooring-log/src/main.ts\n"),
  ]);
  out.push({
    name: "bytes not UTF-8",
    args: [at("not-utf8.tsv", latin)],
    says: /2 entries not UTF-8, read with U\+FFFD/,
  });
  // ABSOLUTE_AND_RELATIVE: two listings appended, one from /srv, one from a relative start.
  const mixed = at(
    "mixed.tsv",
    "4096\t/srv/orchard/rows/north.csv\n2048\t/srv/orchard/ledger.txt\n512\tcellar/casks/c1.log\n300\tcellar/casks/c2.log\n",
  );
  out.push({
    name: "absolute and relative",
    args: [mixed],
    says: /absolute and relative paths read as two trees/,
  });
  // IDS_RENUMBERED: the April chart with every id renumbered (names and managers kept), pseudonymized.
  const april = join(fixtures, "examples", "org-april.csv");
  const [head, ...rows] = readFileSync(april, "utf8").trimEnd().split("\n");
  const id = (old) => (old === "" ? "" : `R${100 + 7 * Number(old.slice(1))}`);
  const renumbered = rows
    .map((r) => r.split(","))
    .map(([i, m, ...rest]) => [id(i), id(m), ...rest].join(","));
  out.push({
    name: "org diff, ids renumbered, pseudonymized",
    args: [
      "diff",
      join(fixtures, "examples", "org-march.csv"),
      at("org-april-renumbered.csv", `${[head, ...renumbered].join("\n")}\n`),
      "--parent-field",
      "manager",
      "--pseudonymize",
    ],
    kind: "diff",
    env: secret,
    people: april,
    says: /ids look renumbered \([0-9]+ nodes pair by path\)/,
  });
  // Every record field compared: an invented harbour's services, seven fields besides the name.
  const fields = ["version", "image", "owner_team", "region", "tier", "replicas", "port"];
  const names = [
    "harbour-ledger",
    "mooring-log",
    "quayside-dash",
    "brackwater",
    "tide-gauge",
    "pilot-roster",
  ];
  const table = (edited) => {
    const lines = [
      ["id", "parent", "name", ...fields].join(","),
      "s0,,tidewater,1.0,base:1,platform,eu,1,1,80",
    ];
    names.forEach((n, k) => {
      const row = [`s${k + 1}`, k < 3 ? "s0" : `s${(k % 3) + 1}`, n, `2.${k}`, `${n}:${k}`];
      row.push(
        ["ops", "core", "edge"][k % 3],
        ["eu", "us"][k % 2],
        String((k % 3) + 1),
        "2",
        String(8000 + k),
      );
      if (edited && k % 3 === 2) row[3] += ".1";
      if (edited && k === 4) row[4] += "-patch";
      if (edited && k === 1) row[8] = "9";
      lines.push(row.join(","));
    });
    return `${lines.join("\n")}\n`;
  };
  out.push({
    name: "services diff, seven fields compared",
    args: ["diff", at("services-old.csv", table(false)), at("services-new.csv", table(true))],
    kind: "diff",
    says: /compared: version, image, owner_team and 4 other fields/,
  });
  // SBOMs on the machine, and a copy with every fifth component's version bumped and a link dropped.
  const sboms = execFileSync(
    "sh",
    ["-c", "find /usr /opt /root -name '*.cyclonedx.json' 2>/dev/null | sort | head -2"],
    { maxBuffer: 1 << 20 },
  )
    .toString()
    .split("\n")
    .filter(Boolean);
  sboms.forEach((file, k) => {
    const doc = JSON.parse(readFileSync(file, "utf8"));
    for (const [j, c] of (doc.components ?? []).entries())
      if (j % 5 === 2) c.version = `${c.version ?? "0"}.1`;
    const first = (doc.dependencies ?? []).find((d) => (d.dependsOn ?? []).length > 0);
    if (first) first.dependsOn = first.dependsOn.slice(1);
    const edited = at(`sbom-${k}-edited.json`, JSON.stringify(doc));
    out.push({ name: `sbom ${file}`, args: [file], graph: true, says: /read as an SBOM's dependency graph/ });
    out.push({
      name: `sbom diff ${file}`,
      args: ["diff", file, edited],
      kind: "diff",
      graph: true,
      says: /; read as an SBOM's dependency graph;/,
      unsaid: /(OLD|NEW): read as an SBOM/,
    });
  });
  return out;
}
cases.push(...notedInputs());

const widths = viewsOnly ? [] : quick ? [32, 60, undefined] : [30, 32, 40, 60, 80, 120, undefined];
// 12 and 16: budgets where the key is printed in part on the deep foci (it must say where the rest is).
const budgets = quick ? [10, 20] : [6, 8, 10, 12, 14, 16, 20, 40];
let screens = 0;
let noted = 0;
let partial = 0;
let failed = 0;
let refused = 0;
/** [budget, screen] the budgets `key left out` screens name, for the nesting check below. */
const keyNamed = [];
for (const c of cases) {
  for (const width of widths) {
    for (const budget of budgets) {
      for (const legend of [false, true]) {
        if (legend && budget < 40) continue;
        const args = [...c.args, "--budget", String(budget), ...(legend ? ["--legend"] : [])];
        const env = {
          ...(width === undefined ? { NO_COLOR: "1" } : { COLUMNS: String(width), NO_COLOR: "1" }),
          ...c.env,
        };
        const r = await cli(args, env);
        const what = `${c.name} | COLUMNS=${width ?? "-"} ${args.slice(c.args.length).join(" ")}`;
        if (c.people) {
          // Every format: the text, its JSON and its Markdown, and what each says on standard error.
          const formats = [
            r,
            ...(await Promise.all(["json", "markdown"].map((f) => cli([...args, "--format", f], env)))),
          ];
          const said = formats.map((f) => `${f.stdout}\n${f.stderr}`).join("\n");
          const named = peopleIn(c.people).filter(
            (n) => said.includes(n) || (n.split(" ")[0].length > 3 && said.includes(n.split(" ")[0])),
          );
          if (named.length > 0) {
            failed++;
            console.log(
              `FAIL ${what}\n  names ${named.length} people under --pseudonymize: ${named.slice(0, 3).join(", ")}`,
            );
          }
        }
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
        let room = null;
        const problems = checkText(r.stdout, {
          budget,
          width,
          legend,
          kind: c.kind,
          graph: c.graph,
          noted: (b) => {
            noted++;
            room = b;
          },
          partial: () => partial++,
        });
        // A screen that says `key left out: --budget N has room`: N prints the key, and N - 1 does not.
        if (room !== null && room !== undefined) {
          keyNamed.push([room, { name: c.name, width }]);
          // A key whole: one in part (`rest: --legend`) is printed from a smaller budget.
          const keyed = async (b) => {
            const text = (await cli([...c.args, "--budget", String(b)], env)).stdout;
            return /^key: /m.test(text) && !/(^| )rest: --legend(;|$)/m.test(text);
          };
          if (!(await keyed(room)))
            problems.push(`says --budget ${room} has room for the key, but it prints none`);
          if (room - 1 > budget && (await keyed(room - 1)))
            problems.push(`says --budget ${room} is the smallest with the key, but ${room - 1} prints it`);
        }
        // Colour changes nothing but the escapes.
        if (!legend && budget === budgets[0]) {
          const coloured = await cli([...args, "--color", "always"], {
            ...(width === undefined ? {} : { COLUMNS: String(width) }),
            ...c.env,
          });
          if (coloured.stdout.replace(ANSI, "") !== r.stdout)
            problems.push("coloured text differs from plain");
        }
        if (width === undefined && !legend && c.kind !== "diff") {
          const json = await cli([...args, "--format", "json"], env);
          problems.push(...checkJson(json.stdout, budget));
        }
        // The header's words for a note, whole however the header wraps (and in Markdown's paragraph).
        if (c.says) {
          const lines = r.stdout.replace(ANSI, "").split("\n");
          const end = lines.findIndex((l) => /^key: /.test(l) || /^[*:.&] /.test(l));
          const head = lines.slice(0, end).join("\n").replaceAll("\n  ", " ");
          if (!c.says.test(head)) problems.push(`the header does not say ${c.says} whole`);
          if (c.unsaid?.test(head)) problems.push(`the header says ${c.unsaid}`);
          if (width === undefined && !legend) {
            const md = (await cli([...args, "--format", "markdown"], env)).stdout.split("\n\n")[0];
            // Markdown's escapes read as the characters they stand for (CommonMark 0.31, 2.4).
            if (!c.says.test(md.replaceAll("\\\n", " ").replace(/\\([!-/:-@[-`{-~])/g, "$1")))
              problems.push(`Markdown's header does not say ${c.says}`);
          }
        }
        if (problems.length > 0) {
          failed++;
          console.log(`FAIL ${what}\n  ${problems.join("\n  ")}\n${r.stdout.replace(/^/gm, "  | ")}`);
        }
      }
    }
  }
}
// --- nesting across budgets ------------------------------------------------------------------------
// Raising the budget by one never hides a node (guarantee 2 of docs/selection.md), the key's rows
// included: where the whole key has no room the key in part takes the rows the root and the focus
// paths leave, and where not even its fewest fit, the key is left out and the tree keeps those lines.
// Checked at each budget above and the one after it, and at the budget a screen names for its key and
// the one before it.
/** The paths a screen shows (its JSON's nodes), and the lines its text gives the tree. */
async function shownAt(args, budget, env) {
  const text = await cli([...args, "--budget", String(budget)], env);
  const json = await cli([...args, "--budget", String(budget), "--format", "json"], env);
  if (text.code !== 0 || json.code !== 0) return null;
  const paths = new Set();
  const walk = (n) => {
    paths.add(n.path);
    for (const c of n.children ?? []) walk(c);
  };
  walk(JSON.parse(json.stdout).root);
  const all = text.stdout.trimEnd().split("\n");
  return { paths, tree: all.length - all.findIndex((l) => /^[*:.&] /.test(l)) };
}
let pairs = 0;
let unnested = 0;
for (const c of cases) {
  for (const width of widths) {
    const env = {
      ...(width === undefined ? { NO_COLOR: "1" } : { COLUMNS: String(width), NO_COLOR: "1" }),
      ...c.env,
    };
    const at = new Set(budgets);
    for (const [budget, named] of keyNamed)
      if (named.width === width && named.name === c.name) at.add(budget - 1);
    for (const budget of at) {
      const [lower, upper] = [await shownAt(c.args, budget, env), await shownAt(c.args, budget + 1, env)];
      if (lower === null || upper === null) continue;
      pairs++;
      const lost = [...lower.paths].filter((p) => !upper.paths.has(p));
      if (lost.length === 0) continue;
      failed++;
      unnested++;
      console.log(
        `FAIL ${c.name} | COLUMNS=${width ?? "-"} --budget ${budget} -> ${budget + 1}\n  hides ${lost.length} shown node(s) with ${upper.tree} tree lines for ${lower.tree}: ${lost.slice(0, 3).join(", ")}`,
      );
    }
  }
}

// --- the interactive view ------------------------------------------------------------------------
// Its screens are `espalier`'s behind a two-column gutter, over a status row: the key says every mark
// and cut on them, or the status row sends the reader to the help for them (`h: keys, marks`).
const { draw } = await import(join(dist, "explore/screen.js"));
const { diffSession, summarySession } = await import(join(dist, "explore/session.js"));
const { prepareDiff } = await import(join(dist, "diff/diff-trees.js"));
const { GUTTER, startState } = await import(join(dist, "explore/update.js"));
const { resolveFoci } = await import(join(dist, "focus/resolve.js"));
const { loadTree } = await import(join(dist, "load/index.js"));
const { defaultLoadOptions } = await import(join(dist, "load/load-options.js"));
const { prepare } = await import(join(dist, "summarize.js"));
const { palette } = await import(join(dist, "render/palette.js"));

const views = [
  { name: "npm ls", file: npmLs, format: "json", foci: [] },
  { name: "npm ls, focus", file: npmLs, format: "json", foci: ["**/vitest"] },
  { name: "find /usr/share", file: share.file, format: "paths", foci: [] },
  { name: "find /usr/share, deep focus", file: share.file, format: "paths", foci: [share.deep] },
  { name: "npm ls diff", file: npmLs, edited: npmLsEdited, format: "json", foci: [] },
  {
    name: "find /usr/share diff",
    file: share.file,
    edited: share.edited,
    format: "paths",
    foci: [share.mid],
  },
  {
    name: "org chart, pseudonymized",
    file: orgCsv,
    format: "csv",
    fields: { parentField: "manager", sizeField: "cost" },
    foci: [],
    pseudonymKey: secret.ESPALIER_PSEUDONYM_KEY,
    people: orgCsv,
  },
];
const sizes =
  quick && !viewsOnly
    ? [
        [14, 34],
        [24, 62],
      ]
    : [
        [10, 32],
        [14, 34],
        [20, 42],
        [24, 62],
        [24, 82],
        [40, 122],
      ];
let viewsRead = 0;
let pointed = 0;
for (const v of views) {
  const load = (file) =>
    loadTree(readFileSync(file, "utf8"), {
      ...defaultLoadOptions,
      ...v.fields,
      file,
      format: v.format,
      rootName: file.split("/").pop(),
    });
  const look = { units: "plain", chains: true, palette: palette(false), pseudonymKey: v.pseudonymKey };
  const prepared = v.edited ? prepareDiff(load(v.file), load(v.edited), {}) : prepare(load(v.file));
  const session = v.edited ? diffSession(prepared, look) : summarySession(prepared, look);
  for (const [rows, cols] of sizes) {
    const what = `explore ${v.name} | ${rows}x${cols}`;
    const state = startState(session, {
      rows,
      cols,
      foci: resolveFoci(prepared.index, v.foci),
      importance: "depth",
      fociFile: "foci.txt",
    });
    const screen = draw(session, state, false);
    const problems = [];
    for (const r of screen.rows) if (stringWidth(r) > cols) problems.push(`wider than ${cols}: ${r}`);
    if (screen.rows.length !== rows) problems.push(`${screen.rows.length} rows for ${rows}`);
    const status = screen.rows[screen.rows.length - 1];
    if (v.people) {
      const shown = screen.rows.join("\n");
      const named = peopleIn(v.people).filter((n) => shown.includes(n));
      if (named.length > 0) problems.push(`names ${named.length} people under a pseudonym key: ${named[0]}`);
    }
    // A screen too small for the root and the focus paths says what it needs, and shows no tree.
    if (
      screen.cursorRow === null &&
      /needs [0-9]+ (rows|columns)$/.test(screen.rows[0]) &&
      problems.length === 0
    ) {
      refused++;
      continue;
    }
    viewsRead++;
    const text = `${screen.rows
      .slice(0, -1)
      .map((r) => r.slice(GUTTER))
      .join("\n")
      .trimEnd()}\n`;
    const read = checkText(text, {
      budget: rows - 1,
      width: cols - GUTTER,
      kind: v.edited ? "diff" : "summary",
    });
    if (/ h: keys, marks$/.test(status)) {
      pointed++;
      console.log(`NOTE ${what}: the key says part, the status row points to the help`);
      // What is wrong besides the key's words is still wrong.
      problems.push(...read.filter((p) => !/not explained|no key|not said/.test(p)));
    } else problems.push(...read);
    if (problems.length > 0) {
      failed++;
      console.log(
        `FAIL ${what}\n  ${problems.join("\n  ")}\n${screen.rows.join("\n").replace(/^/gm, "  | ")}`,
      );
    }
  }
}
console.log(
  `${screens} screens read (${noted} saying the key was left out, ${partial} with a key in part), ${refused} budgets refused (each checked), ${pairs} budgets and the next compared (${unnested} hiding a node), ${viewsRead} interactive screens read (${pointed} pointing to the help for the marks), ${failed} failed`,
);
rmSync(work, { recursive: true, force: true });
process.exitCode = failed > 0 ? 1 : 0;
