import { Buffer } from "node:buffer";
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool } from "../helpers/file-tree.js";

// Field tests: edge lists (a parent and a child a line) and edge tables whose ids hold Latin-1 bytes
// (ISO/IEC 8859-1: 0xE9 e-acute), made by GNU find from a folder an old system named. Each such byte
// reads as U+FFFD (RFC 3629; WHATWG Encoding Standard, UTF-8 decoder): path lists and tables said so
// with UNDECODABLE_BYTES, an edge list or table printed "caf\uFFFD-menu.txt" with no word, exit 0.
// Counts are checked against the WHATWG decoder in fatal mode (TextDecoder) and GNU grep in a UTF-8
// locale, whose "." matches no byte that is not UTF-8 (grep -c -a -v -x '.*' counts such lines).
const gnu = isGnuTool("find") && isGnuTool("grep");
const latin1 = (text: string) => Buffer.from(text, "latin1");

let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-not-utf8-edges-"));
  // An invented bakery's shared folder, two names and a folder written by an old system in Latin-1.
  const root = join(base, "bakery");
  mkdirSync(Buffer.concat([latin1(`${root}/`), latin1("menus/p\xe2tisserie")]), { recursive: true });
  for (const name of [
    "menus/caf\xe9-menu.txt",
    "menus/p\xe2tisserie/tarte.txt",
    "menus/weekly.txt",
    "recipes.txt",
  ])
    writeFileSync(Buffer.concat([latin1(`${root}/`), latin1(name)]), "flour\n");
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

function sh(script: string): Buffer {
  return execFileSync("sh", ["-c", script], { cwd: base, env: { ...process.env, LC_ALL: "C.UTF-8" } });
}

/** The distinct ids of an edge list (tab-separated) that the WHATWG decoder refuses in fatal mode. */
function idsNotUtf8(list: Buffer): number {
  const ids = new Set<string>();
  for (const line of list.toString("latin1").split("\n").filter(Boolean))
    for (const id of line.split("\t")) ids.add(id);
  const fatal = new TextDecoder("utf-8", { fatal: true });
  let bad = 0;
  for (const id of ids) {
    try {
      fatal.decode(latin1(id));
    } catch {
      bad++;
    }
  }
  return bad;
}

describe("edge lists whose ids are not UTF-8", () => {
  it.skipIf(!gnu)(
    "an edge list (find -printf '%h\\t%f\\n') says UNDECODABLE_BYTES with its ids' count",
    async () => {
      const list = sh("find bakery -mindepth 1 -printf '%h\\t%f\\n' | sort");
      const bad = idsNotUtf8(list);
      // caf\xe9-menu.txt, p\xe2tisserie, and bakery/menus/p\xe2tisserie (the parent of tarte.txt).
      expect(bad).toBe(3);
      const r = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin: list });
      expect(r.code).toBe(0);
      const firstLine =
        list
          .toString("latin1")
          .split("\n")
          .findIndex((l) => /[\x80-\xff]/.test(l)) + 1;
      expect(JSON.parse(r.stdout).input.notes).toEqual([
        expect.objectContaining({ code: "UNDECODABLE_BYTES", count: bad, line: firstLine }),
      ]);
      expect(r.stderr).toContain(`${bad} ids hold bytes that are not UTF-8`);
      const text = await cli(["-", "--input-format", "edges"], { stdin: list });
      expect(text.stdout.split("\n")[0]).toContain(`; ${bad} entries not UTF-8, read with U+FFFD;`);
      // Converted first (iconv, glibc), as the note says: no note, and the same nodes.
      const converted = sh("find bakery -mindepth 1 -printf '%h\\t%f\\n' | sort | iconv -f latin1 -t utf-8");
      const clean = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin: converted });
      expect(clean.stderr).toBe("");
      expect(JSON.parse(clean.stdout).totals.nodes).toBe(JSON.parse(r.stdout).totals.nodes);
    },
  );

  it.skipIf(!gnu)("an edge table (parent,child) says UNDECODABLE_BYTES with its rows' count", async () => {
    const table = Buffer.concat([
      Buffer.from("parent,child\n"),
      sh("find bakery -mindepth 1 -printf '%h,%f\\n' | sort"),
    ]);
    const rows = Number(sh("find bakery -mindepth 1 -printf '%h,%f\\n' | grep -c -a -v -x '.*'").toString());
    expect(rows).toBe(3);
    const r = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin: table });
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).input.notes).toEqual([
      expect.objectContaining({ code: "UNDECODABLE_BYTES", count: rows }),
    ]);
  });

  it("an edge list all ASCII, or UTF-8, has no note", async () => {
    for (const stdin of ["bakery\tmenus\nmenus\tweekly.txt\n", "bakery\tmenus\nmenus\tcafé-menu.txt\n"]) {
      const r = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin });
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout).input.notes).toBeUndefined();
    }
  });
});
