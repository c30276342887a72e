import {
  chmod,
  link,
  mkdir,
  mkdtemp,
  readdir,
  readFile,
  rm,
  stat,
  symlink,
  writeFile,
} from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { nodeOutputFiles, type OutputFiles } from "../../src/cli/write-output.js";
import { cli } from "../helpers/cli.js";

const LIST = "10\tquill/a\n20\tquill/b\n5\tquill/c/d\n";

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), "espalier-output-"));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** The code in the one error line: `espalier: …[CODE]`. */
function errorCode(stderr: string): string | undefined {
  return /\[([A-Z_]+)\]\n$/.exec(stderr)?.[1];
}

describe("espalier <input> --output FILE", () => {
  it("writes what standard output would get to FILE, prints nothing, and leaves no temporary file", async () => {
    const input = join(dir, "tree.paths");
    await writeFile(input, LIST);
    const plain = await cli([input, "--budget", "9"]);
    const out = join(dir, "summary.txt");
    const r = await cli([input, "--budget", "9", "--output", out]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe("");
    expect(r.stderr).toBe("");
    expect(await readFile(out, "utf8")).toBe(plain.stdout);
    expect((await readdir(dir)).sort()).toEqual(["summary.txt", "tree.paths"]);
  });

  it("replaces an existing FILE whole and keeps its permissions (-o is the short form)", async () => {
    const input = join(dir, "tree.paths");
    await writeFile(input, LIST);
    const out = join(dir, "summary.json");
    await writeFile(out, "old content that is longer than nothing\n".repeat(100));
    await chmod(out, 0o640);
    const r = await cli([input, "--format", "json", "-o", out]);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(await readFile(out, "utf8")).totals.nodes).toBe(5);
    expect((await stat(out)).mode & 0o777).toBe(0o640);
  });

  it("replaces the file a link at FILE points to, keeping the link", async () => {
    const input = join(dir, "tree.paths");
    await writeFile(input, LIST);
    const real = join(dir, "real.txt");
    await writeFile(real, "old\n");
    const linked = join(dir, "linked.txt");
    await symlink(real, linked);
    const r = await cli([input, "-o", linked]);
    expect(r.code, r.stderr).toBe(0);
    expect(await readFile(real, "utf8")).toContain("quill");
    expect((await readdir(dir)).sort()).toEqual(["linked.txt", "real.txt", "tree.paths"]);
  });

  it("refuses to overwrite the input, under any name: same path, another spelling, a symlink, a hard link", async () => {
    await mkdir(join(dir, "sub"));
    const input = join(dir, "tree.paths");
    await writeFile(input, LIST);
    await symlink(input, join(dir, "alias.paths"));
    await link(input, join(dir, "hard.paths"));
    for (const target of [
      input,
      join(dir, "sub", "..", "tree.paths"),
      join(dir, "alias.paths"),
      join(dir, "hard.paths"),
    ]) {
      const r = await cli([input, "--output", target]);
      expect(r.code, target).toBe(2);
      expect(errorCode(r.stderr)).toBe("USAGE");
      expect(r.stderr.split("\n")).toHaveLength(2); // one line and its line end
      expect(r.stdout).toBe("");
      expect(await readFile(input, "utf8")).toBe(LIST);
    }
  });

  it("refuses to overwrite the file named by --focus-from", async () => {
    const input = join(dir, "tree.paths");
    await writeFile(input, LIST);
    const foci = join(dir, "foci.txt");
    await writeFile(foci, "a\n");
    const r = await cli([input, "--focus-from", foci, "--output", foci]);
    expect(r.code).toBe(2);
    expect(errorCode(r.stderr)).toBe("USAGE");
    expect(await readFile(foci, "utf8")).toBe("a\n");
  });

  it("refuses to overwrite the config file in use: --config FILE, or .espalier.yaml in the current folder", async () => {
    const input = join(dir, "tree.paths");
    await writeFile(input, LIST);
    const config = join(dir, "espalier.yaml");
    await writeFile(config, "budget: 9\n");
    for (const args of [
      [input, "--config", config, "--output", config],
      ["diff", input, input, "--config", config, "-o", config],
    ]) {
      const r = await cli(args);
      expect(r.code, args.join(" ")).toBe(2);
      expect(errorCode(r.stderr)).toBe("USAGE");
      expect(await readFile(config, "utf8")).toBe("budget: 9\n");
    }
    // The default name is looked up in the current folder, here faked to be the temporary one.
    const files: OutputFiles = {
      ...nodeOutputFiles,
      realpath: (path) => nodeOutputFiles.realpath(path === ".espalier.yaml" ? config : path),
    };
    const r = await cli([input, "--output", config], {
      files: { ".espalier.yaml": "budget: 9\n" },
      outputFiles: files,
    });
    expect(r.code).toBe(2);
    expect(errorCode(r.stderr)).toBe("USAGE");
    expect(await readFile(config, "utf8")).toBe("budget: 9\n");
    // With --without-config no config file is read, so the file is an ordinary target.
    const free = await cli([input, "--without-config", "--output", config]);
    expect(free.code, free.stderr).toBe(0);
    expect(await readFile(config, "utf8")).toContain("quill");
  });

  it("refuses to overwrite the file standard input was redirected from", async () => {
    const out = join(dir, "summary.txt");
    await writeFile(out, LIST);
    // /dev/stdin resolves to the redirected file; this process's own stdin is not, so it is faked here.
    const files: OutputFiles = {
      ...nodeOutputFiles,
      realpath: (path) => nodeOutputFiles.realpath(path === "/dev/stdin" ? out : path),
    };
    const r = await cli(["-", "--output", out], { stdin: LIST, outputFiles: files });
    expect(r.code).toBe(2);
    expect(errorCode(r.stderr)).toBe("USAGE");
    expect(await readFile(out, "utf8")).toBe(LIST);
  });

  it("creates no file when the input is malformed", async () => {
    const out = join(dir, "summary.txt");
    const r = await cli(["-", "--input-format", "json", "--output", out], { stdin: '{"name": "a", ' });
    expect(r.code).toBe(2);
    expect(errorCode(r.stderr)).toBe("PARSE_JSON");
    expect(await readdir(dir)).toEqual([]);
  });

  it("exits 2 with IO when FILE's folder does not exist or FILE is a folder", async () => {
    for (const target of [join(dir, "missing", "out.txt"), dir]) {
      const r = await cli(["-", "--output", target], { stdin: LIST });
      expect(r.code, target).toBe(2);
      expect(errorCode(r.stderr)).toBe("IO");
      expect(r.stdout).toBe("");
    }
    expect(await readdir(dir)).toEqual([]);
  });

  it("leaves no partial file and the old FILE intact when writing fails half-way", async () => {
    const out = join(dir, "summary.txt");
    await writeFile(out, "previous\n");
    const files: OutputFiles = {
      ...nodeOutputFiles,
      async writeNew(path, text) {
        await nodeOutputFiles.writeNew(path, text.slice(0, 5));
        throw Object.assign(new Error("no space left on device"), { code: "ENOSPC" });
      },
    };
    const r = await cli(["-", "--output", out], { stdin: LIST, outputFiles: files });
    expect(r.code).toBe(2);
    expect(errorCode(r.stderr)).toBe("IO");
    expect(await readFile(out, "utf8")).toBe("previous\n");
    expect(await readdir(dir)).toEqual(["summary.txt"]);
  });

  it("removes the temporary file when the rename fails", async () => {
    const out = join(dir, "summary.txt");
    const files: OutputFiles = {
      ...nodeOutputFiles,
      rename: async () => {
        throw Object.assign(new Error("cross-device link"), { code: "EXDEV" });
      },
    };
    const r = await cli(["-", "--output", out], { stdin: LIST, outputFiles: files });
    expect(r.code).toBe(2);
    expect(errorCode(r.stderr)).toBe("IO");
    expect(await readdir(dir)).toEqual([]);
  });

  it("lays FILE out as a file when run from a terminal: default budget 40, no width, no colour", async () => {
    // Field defect: `espalier x -o view.txt` on a 12-row, 40-column terminal wrote 11 lines cut to 40
    // columns with colour escapes into the file, which is no terminal.
    const input = new URL("../../fixtures/tidewater-files.paths", import.meta.url).pathname;
    const piped = await cli([input]);
    const envs: Record<string, string>[] = [{}, { FORCE_COLOR: "1" }];
    for (const env of envs) {
      const out = join(dir, "view.txt");
      const r = await cli([input, "-o", out], { tty: { rows: 12, columns: 40 }, env });
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toBe("");
      const written = await readFile(out, "utf8");
      expect(written).toBe(piped.stdout);
      expect(written).not.toContain("\x1b");
      expect(written.split("\n")[0]).toMatch(/40 of 40 lines \(default budget: not a terminal\)$/);
    }
    const out = join(dir, "coloured.txt");
    const asked = await cli([input, "-o", out, "--color", "always"], { tty: { rows: 12, columns: 40 } });
    expect(asked.code, asked.stderr).toBe(0);
    expect(await readFile(out, "utf8")).toContain("\x1b[");
    const shown = await cli([input], { tty: { rows: 12, columns: 40 } });
    expect(shown.stdout.split("\n").length - 1).toBe(11);
  });

  it("writes a diff to FILE too, and refuses either version as the target", async () => {
    const before = join(dir, "old.paths");
    const after = join(dir, "new.paths");
    await writeFile(before, LIST);
    await writeFile(after, `${LIST}7\tquill/e\n`);
    const out = join(dir, "diff.txt");
    const plain = await cli(["diff", before, after]);
    expect(plain.code, plain.stderr).toBe(0);
    const r = await cli(["diff", before, after, "--output", out]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toBe("");
    expect(await readFile(out, "utf8")).toBe(plain.stdout);
    for (const target of [before, after]) {
      const refused = await cli(["diff", before, after, "-o", target]);
      expect(refused.code).toBe(2);
      expect(errorCode(refused.stderr)).toBe("USAGE");
    }
    expect(await readFile(before, "utf8")).toBe(LIST);
  });
});
