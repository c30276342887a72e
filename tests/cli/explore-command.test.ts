import { spawnSync } from "node:child_process";
import { lstatSync, mkdtempSync, readFileSync, symlinkSync, writeFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { exploreCommand, runView, type Terminal } from "../../src/cli/explore-command.js";
import type { CliIO } from "../../src/cli/io.js";
import { summaryOptionsSchema } from "../../src/cli/options.js";
import { type ReadBound, readBounded } from "../../src/cli/read-bounded.js";
import { summarySession } from "../../src/explore/session.js";
import { ENTER, ERASE_LINE, HOME, LEAVE } from "../../src/explore/terminal.js";
import { startState } from "../../src/explore/update.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { namesToArray } from "../../src/model/names.js";
import { prepare } from "../../src/summarize.js";
import { cli } from "../helpers/cli.js";
import { leakedNames } from "../helpers/leaked-names.js";

/** A key, a resize, or a pause until the screen has shown `shown` (at most 30 s, then the next input). */
type Input = string | { resize: [number, number] } | { shown: string };

/** A terminal that types `inputs` one read at a time and records what is drawn. */
class FakeTerminal implements Terminal {
  written = "";
  log: string[] = [];
  constructor(
    private readonly inputs: Input[],
    private r = 24,
    private c = 80,
  ) {}
  rows() {
    return this.r;
  }
  cols() {
    return this.c;
  }
  write(text: string) {
    this.written += text;
  }
  start(onBytes: (b: Uint8Array) => void, onResize: () => void) {
    this.log.push("raw on");
    const feed = (k: number) => {
      if (k >= this.inputs.length) return;
      const input = this.inputs[k];
      if (typeof input === "string") onBytes(new TextEncoder().encode(input));
      else if ("shown" in input) {
        // Waits for what was drawn, not for a time: a slow machine may take any while to read a file.
        const until = Date.now() + 30_000;
        const poll = () => {
          if (this.written.includes(input.shown) || Date.now() > until) feed(k + 1);
          else setTimeout(poll, 10);
        };
        poll();
        return;
      } else {
        [this.r, this.c] = input.resize;
        onResize();
      }
      setImmediate(() => feed(k + 1));
    };
    setImmediate(() => feed(0));
  }
  stop() {
    this.log.push("raw off");
  }
  /** The rows of the last frame drawn. */
  lastFrame(): string[] {
    const frames = this.written.split(HOME);
    const last = frames[frames.length - 1].split(LEAVE)[0];
    return last.split("\r\n").map((row) => row.split(ERASE_LINE)[0]);
  }
}

const io = (env: Record<string, string> = {}): CliIO => ({
  stdout: { write: () => true, isTTY: true, rows: 24, columns: 80 },
  stderr: { write: () => true },
  readStdin: async () => Buffer.alloc(0),
  // As the launcher reads: bounded when the caller gives a bound (bin/espalier.js).
  readFile: (p: string, bound?: ReadBound) => (bound ? readBounded(p, bound) : readFile(p)),
  env,
});

const options = (extra: Record<string, unknown> = {}) =>
  summaryOptionsSchema.parse({ parentField: "manager", sizeField: "cost", color: "never", ...extra });
const ORG = "fixtures/quillfeather-org.csv";

/** The arguments bash reads from a printed command line. */
/**
 * A screen's rows (or the CLI's lines) with the key taken out, and where it stood: the view's key
 * points to its help (`h explains more`), the CLI's to `--legend`, so at some widths the two say the
 * rest in other words; every other row must be the same.
 */
function withoutKey(rows: readonly string[], width: number): { at: number; rows: string[] } {
  const at = rows.findIndex((row) => row.startsWith("key: "));
  const out = [...rows];
  if (at >= 0) out.splice(at, width < 60 ? 2 : 1);
  return { at, rows: out };
}

/** Checks that `printed` (the CLI's output) shows the same rows as the screen's `rows`, key aside. */
function expectSameScreen(printed: string, rows: readonly string[], width: number): void {
  const cli = withoutKey(printed.trimEnd().split("\n"), width);
  const view = withoutKey(rows, width);
  expect(view.at).toBeGreaterThan(0);
  expect(cli.at).toBe(view.at);
  expect(cli.rows).toEqual(view.rows);
}

function argsOf(line: string): string[] {
  const out = spawnSync("bash", ["-c", `printf '%s\\0' ${line}`], { encoding: "utf8" });
  return out.stdout.split("\0").slice(0, -1);
}

describe("espalier explore", () => {
  it("refuses when standard output is not a terminal: USAGE, exit 2, nothing on standard output", async () => {
    const r = await cli(["explore", ORG, "--parent-field", "manager"]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/\[USAGE\]\n$/);
  });

  it("enters the alternate screen, and q leaves it with raw mode off, printing nothing", async () => {
    const terminal = new FakeTerminal(["\u001b[B", "\u001b[D", "q"]);
    const out = await exploreCommand(ORG, undefined, options({ focus: ["Q2417"] }), io(), { terminal });
    expect(out).toEqual({ text: "", exitCode: 0 });
    expect(terminal.written.startsWith(ENTER)).toBe(true);
    expect(terminal.written.endsWith(LEAVE)).toBe(true);
    expect(terminal.log).toEqual(["raw on", "raw off"]);
  });

  it("Ctrl-C leaves the same way with exit status 130", async () => {
    const terminal = new FakeTerminal(["\u0003"]);
    const out = await exploreCommand(ORG, undefined, options(), io(), { terminal });
    expect(out.exitCode).toBe(130);
    expect(terminal.written.endsWith(LEAVE)).toBe(true);
  });

  it("p prints a command line that, run without the view, prints the same tree as the last screen", async () => {
    const terminal = new FakeTerminal([
      "\u001b[B",
      "\u001b[B",
      "+",
      "\u001b[D",
      "i",
      { resize: [18, 70] },
      "p",
    ]);
    const out = await exploreCommand(ORG, undefined, options({ focus: ["Q2417"] }), io(), { terminal });
    expect(out.text).toMatch(
      /^espalier fixtures\/quillfeather-org.csv --size-field cost --parent-field manager /,
    );
    expect(out.text).toContain("--budget 17");
    expect(out.text).toContain("--importance size");
    const screen = terminal.lastFrame();
    const tree = screen
      .slice(0, -1)
      .filter((row) => row !== "")
      .map((row) => row.slice(2));
    const args = argsOf(out.text.trim()).slice(1);
    const printed = await cli([...args, "--width", "68", "--color", "never"]);
    expect(printed.code).toBe(0);
    expectSameScreen(printed.stdout, tree, 68);
  });

  it("p's command line prints the screen's numbers in the same units, on an input whose sizes are not bytes", async () => {
    // A "size" field of a JSON document counts in the input's own unit: printed plain, by the summary
    // and by the view alike (docs/input.md).
    const terminal = new FakeTerminal(["\u001b[B", "p"]);
    const out = await exploreCommand(
      "fixtures/tidewater-deps.json",
      undefined,
      summaryOptionsSchema.parse({ color: "never" }),
      io(),
      { terminal },
    );
    const tree = terminal
      .lastFrame()
      .slice(0, -1)
      .filter((row) => row !== "")
      .map((row) => row.slice(2));
    const printed = await cli([...argsOf(out.text.trim()).slice(1), "--width", "78", "--color", "never"]);
    expect(printed.code).toBe(0);
    expectSameScreen(printed.stdout, tree, 78);
    expect(tree.join("\n")).not.toMatch(/[KMG]iB/);
  });

  it("w writes the foci to the file typed, read back by --focus-from", async () => {
    const dir = mkdtempSync(join(tmpdir(), "espalier-explore-"));
    const file = join(dir, "team.foci");
    const erase = "\u007f".repeat("foci.txt".length);
    const terminal = new FakeTerminal(["\u001b[D", "w", erase, file, "\r", "q"]);
    await exploreCommand(ORG, undefined, options({ focus: ["Q2417"] }), io(), { terminal });
    const written = readFileSync(file, "utf8");
    // The parent of Q2417 (the cursor, after Left) and Q2417 itself (pinned, as given on the command line).
    expect(written).toBe(
      "Arjun Yarford/Sofia Emberrian/Thea Corrquist/Dov Larton/Esme Orby\n" +
        "Arjun Yarford/Sofia Emberrian/Thea Corrquist/Dov Larton/Esme Orby/Marit Okonkwo-Lund\n",
    );
    const again = await cli([ORG, "--parent-field", "manager", "--focus-from", file, "--budget", "23"]);
    expect(again.code).toBe(0);
    expect(again.stdout).toContain("* Esme Orby");
  });

  it("restores the terminal and rethrows when the view fails (a crash mid-session)", async () => {
    const tree = loadTree(readFileSync(ORG, "utf8"), { ...defaultLoadOptions, parentField: "manager" });
    const real = summarySession(prepare(tree), { units: "plain", chains: true });
    let calls = 0;
    const failing = {
      ...real,
      fit: (...args: Parameters<typeof real.fit>) => {
        if (++calls > 3) throw new Error("boom");
        return real.fit(...args);
      },
    };
    const terminal = new FakeTerminal(["\u001b[B", "\u001b[B", "\u001b[B", "\u001b[B"]);
    const start = startState(failing, {
      rows: 24,
      cols: 80,
      foci: new Int32Array(0),
      importance: "depth",
      fociFile: "f",
    });
    await expect(
      runView(failing, start, terminal, false, {
        size: () => ({ rows: 24, cols: 80 }),
        write: async () => ({ kind: "work" }),
      }),
    ).rejects.toThrow("boom");
    expect(terminal.written.endsWith(LEAVE)).toBe(true);
    expect(terminal.log).toEqual(["raw on", "raw off"]);
  });

  it("with --pseudonymize, writes no real name to the terminal or the printed command line", async () => {
    const env = { ESPALIER_PSEUDONYM_KEY: "kept-out-of-the-log" };
    const terminal = new FakeTerminal([
      "\u001b[B",
      "/",
      "Rosa",
      "\r",
      "/",
      "anon-",
      "\r",
      "n",
      "\u001b[C",
      "+",
      "p",
    ]);
    const out = await exploreCommand(
      ORG,
      undefined,
      options({ pseudonymize: true, focus: ["Q2417"] }),
      io(env),
      {
        terminal,
      },
    );
    const tree = loadTree(readFileSync(ORG, "utf8"), { ...defaultLoadOptions, parentField: "manager" });
    const real = namesToArray(tree.name).filter((n) => n.length >= 3 && n !== "(root)");
    expect(leakedNames(terminal.written, real)).toEqual([]);
    expect(leakedNames(out.text, real)).toEqual([]);
    expect(out.text).toContain("--pseudonymize");
    expect(out.text).toMatch(/--focus anon-[0-9a-f]{12}\//);
  });
  it("explores a diff: the changes score as foci, n steps through them, p prints espalier diff", async () => {
    const dir = mkdtempSync(join(tmpdir(), "espalier-explore-diff-"));
    const oldFile = join(dir, "old.json");
    const newFile = join(dir, "new.json");
    writeFileSync(
      oldFile,
      JSON.stringify({
        name: "r",
        children: [
          { name: "a", children: [{ name: "a1" }, { name: "a2" }] },
          { name: "b", children: [{ name: "b1" }] },
        ],
      }),
    );
    writeFileSync(
      newFile,
      JSON.stringify({
        name: "r",
        children: [
          { name: "a", children: [{ name: "a1" }] },
          { name: "b", children: [{ name: "b1" }, { name: "b2" }] },
        ],
      }),
    );
    const terminal = new FakeTerminal(["n", "n", "p"], 12, 60);
    const out = await exploreCommand(
      oldFile,
      newFile,
      options({ parentField: "parent", sizeField: "size" }),
      io(),
      { terminal },
    );
    // The first frame: the totals line, then the tree with both changes shown.
    const frames = terminal.written.split(HOME);
    const first = frames[1].split("\r\n").map((row) => row.split(ERASE_LINE)[0]);
    expect(first[0]).toMatch(/^ {2}diff by path: 1 added, 1 removed/);
    expect(first.join("\n")).toContain("[removed] a2");
    expect(first.join("\n")).toContain("[added] b2");
    // n went to the first change (a2, removed), then the next (b2, added): the view ends focused on b2.
    expect(out.text).toBe(`espalier diff ${oldFile} ${newFile} --focus b/b2 --budget 11\n`);
    // Run without the view, the printed line prints the last screen's rows, the totals line included.
    const screen = terminal
      .lastFrame()
      .slice(0, -1)
      .filter((row) => row !== "")
      .map((row) => row.slice(2));
    const printed = await cli([...argsOf(out.text.trim()).slice(1), "--width", "58", "--color", "never"]);
    expect(printed.code).toBe(0);
    expectSameScreen(printed.stdout, screen, 58);
  });

  it("compares version as espalier diff does, so a version bump is an edit on the screen and in p's command", async () => {
    const dir = mkdtempSync(join(tmpdir(), "espalier-explore-version-"));
    const listing = (v: string) =>
      JSON.stringify({ name: "tidewater", version: "1.0.0", dependencies: { "kelp-log": { version: v } } });
    const oldFile = join(dir, "old.json");
    const newFile = join(dir, "new.json");
    writeFileSync(oldFile, listing("3.1.0"));
    writeFileSync(newFile, listing("3.2.0"));
    const terminal = new FakeTerminal(["p"], 12, 200);
    const out = await exploreCommand(
      oldFile,
      newFile,
      options({ parentField: "parent", sizeField: "size" }),
      io(),
      {
        terminal,
      },
    );
    const screen = terminal
      .lastFrame()
      .slice(0, -1)
      .filter((row) => row !== "")
      .map((row) => row.slice(2));
    expect(screen.join("\n")).toContain("1 edited (compared: version)");
    expect(screen.join("\n")).toContain("[edited version 3.1.0 -> 3.2.0] kelp-log");
    const printed = await cli([...argsOf(out.text.trim()).slice(1), "--width", "198", "--color", "never"]);
    expectSameScreen(printed.stdout, screen, 198);
  });

  it("explores two versions of a graph with --nodes: once for both, or OLD's then NEW's", async () => {
    const edges = "fixtures/tidewater-deps.edges";
    const packages = "fixtures/tidewater-packages.csv";
    const dir = mkdtempSync(join(tmpdir(), "espalier-explore-nodes-"));
    const newer = join(dir, "new-packages.csv");
    // NEW's records give one package another size: 51,000 bytes instead of 40,922.
    writeFileSync(
      newer,
      readFileSync(packages, "utf8").replace(
        "@tidewater/ledger-core,0.7.5,40922",
        "@tidewater/ledger-core,0.8.0,51000",
      ),
    );
    const screen = async (nodes: string[]) => {
      const terminal = new FakeTerminal(["q"], 12, 250);
      const out = await exploreCommand(
        edges,
        edges,
        options({ inputFormat: "edges", sizeField: "size", nodes, units: "bytes" }),
        io(),
        { terminal },
      );
      expect(out.exitCode).toBe(0);
      return terminal.lastFrame().join("\n");
    };
    expect(await screen([packages])).toMatch(/0 edited \(compared: version\), 0 resized, .* \(net \+0 B\)/);
    // 51,000 - 40,922 = 10,078 bytes = 9.8 KiB (IEC 80000-13 binary prefix, 1 KiB = 1,024 B).
    // NEW's records bump ledger-core's version too: one edit, its size change on the edit's tag, as
    // espalier diff reports it (the view compares version as the command does).
    const newerScreen = await screen([packages, newer]);
    expect(newerScreen).toMatch(/1 edited \(compared: version\), 0 resized, .* \(net \+9\.8 KiB\)/);
    expect(newerScreen).toContain("[edited version 0.7.5 -> 0.8.0, +9.8 KiB]");
  });

  it("reports an input or focus error as the summary does, before taking the terminal, naming no real name under --pseudonymize", async () => {
    const env = { ESPALIER_PSEUDONYM_KEY: "kept-out-of-the-log" };
    const tree = loadTree(readFileSync(ORG, "utf8"), { ...defaultLoadOptions, parentField: "manager" });
    const real = namesToArray(tree.name).filter((n) => n.length >= 3 && n !== "(root)");
    for (const args of [
      [ORG, "--parent-field", "manager", "--pseudonymize", "--focus", "Q9999"],
      [ORG, "--parent-field", "manager", "--pseudonymize", "--focus", "anon-0/nobody"],
      [ORG, "--pseudonymize"],
    ]) {
      // A terminal is there (standard output is one): the error comes from the input, not from its absence.
      const explored = await cli(["explore", ...args], { tty: { rows: 24 }, env });
      const printed = await cli(args, { env });
      expect(explored.code).toBe(2);
      expect(explored.stdout).toBe("");
      expect(explored.stderr).not.toContain("USAGE");
      expect(explored.stderr).toBe(printed.stderr);
      expect(leakedNames(explored.stderr, real)).toEqual([]);
    }
  });

  it("with --pseudonymize, a failed write of a config file says only its error code", async () => {
    const dir = mkdtempSync(join(tmpdir(), "espalier-explore-"));
    const file = join(dir, "team.yaml");
    writeFileSync(file, "focus: [Rosa Istrian\n");
    const erase = "\u007f".repeat("foci.txt".length);
    // The file is read and refused (a key pressed before that would end the view first); then q.
    const terminal = new FakeTerminal(
      ["w", erase, file, "\r", { shown: "USAGE (details hidden under --pseudonymize)" }, "q"],
      24,
      200,
    );
    const env = { ESPALIER_PSEUDONYM_KEY: "kept-out-of-the-log" };
    await exploreCommand(ORG, undefined, options({ pseudonymize: true }), io(env), { terminal });
    expect(terminal.written).toContain("USAGE (details hidden under --pseudonymize)");
    expect(terminal.written).not.toContain("Rosa");
    expect(readFileSync(file, "utf8")).toBe("focus: [Rosa Istrian\n");
  });

  it("w onto a config name that links to a device: refused as IO (read bounded as any config), no hang", async () => {
    const dir = mkdtempSync(join(tmpdir(), "espalier-explore-"));
    const file = join(dir, "team.yaml");
    symlinkSync("/dev/zero", file);
    const erase = "\u007f".repeat("foci.txt".length);
    const terminal = new FakeTerminal(["w", erase, file, "\r", { shown: "is a device" }, "q"], 24, 200);
    await exploreCommand(ORG, undefined, options(), io(), { terminal });
    expect(terminal.written).toContain("is a device");
    expect(lstatSync(file).isSymbolicLink()).toBe(true);
  });
});

describe("espalier explore OLD NEW, ids renumbered", () => {
  it("says IDS_RENUMBERED on standard error and on the header, as espalier diff does", async () => {
    // Quillfeather's March chart with every id renumbered (M1 -> P101, …), names and managers kept: the
    // independent count is the chart's 10 rows, 9 below the root, each under a manager of the same name.
    const march = readFileSync("fixtures/examples/org-march.csv", "utf8");
    const [header, ...rows] = march.trimEnd().split("\n");
    const id = (old: string) => (old === "" ? "" : `P${100 + Number(old.slice(1))}`);
    const next = [
      header,
      ...rows.map((row) => row.split(",")).map(([i, m, n]) => [id(i), id(m), n].join(",")),
    ];
    expect(rows).toHaveLength(10);
    const dir = mkdtempSync(join(tmpdir(), "espalier-explore-renumbered-"));
    const oldFile = join(dir, "march.csv");
    const newFile = join(dir, "next.csv");
    writeFileSync(oldFile, march);
    writeFileSync(newFile, `${next.join("\n")}\n`);
    const said: string[] = [];
    const ioWithErr: CliIO = {
      ...io(),
      stderr: {
        write: (t: string) => {
          said.push(t);
          return true;
        },
      },
    };
    const terminal = new FakeTerminal(["q"], 24, 200);
    await exploreCommand(oldFile, newFile, options({ sizeField: "size" }), ioWithErr, { terminal });
    expect(said.join("")).toMatch(/^espalier: note: .*next\.csv: matched by id, .*\[IDS_RENUMBERED\]\n$/);
    const screen = terminal.lastFrame().join("\n");
    expect(screen).toContain("ids look renumbered (9 nodes pair by path)");
    const printed = await cli(["diff", oldFile, newFile, "--parent-field", "manager", "--width", "198"]);
    expect(printed.stdout.split("\n")[0]).toContain("ids look renumbered (9 nodes pair by path)");
  });
});
