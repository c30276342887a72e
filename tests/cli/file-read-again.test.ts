import { execFileSync } from "node:child_process";
import { appendFileSync, mkdirSync, mkdtempSync, renameSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { fileReadAgain, type ReadAgain } from "../../src/cli/file-read-again.js";
import { loadVersions } from "../../src/cli/input.js";
import type { CliIO } from "../../src/cli/io.js";
import { LOAD_THREADS_ENV } from "../../src/cli/load-threads.js";
import { openFile } from "../../src/cli/open-file.js";
import { diffOptionsSchema } from "../../src/cli/options.js";
import { EspalierError } from "../../src/errors.js";
import { KeptJson, LEAST_KEPT_BYTES } from "../../src/load/json/kept-json.js";
import { NodeSink } from "../../src/load/node-sink.js";
import { isGnuTool } from "../helpers/file-tree.js";

// A diff on one thread reads OLD's file again while NEW loads against it (load/json/kept-json.ts):
// only while it is the file its load read.

const dir = mkdtempSync(join(tmpdir(), "espalier-again-"));

/** A port's berths as node objects: more than the 1,000 nodes always read. */
function harbour(changedSize: number): string {
  const berths = Array.from({ length: 1200 }, (_, k) => ({ name: `berth-${k}`, size: k }));
  berths[700].size = changedSize;
  return JSON.stringify({ name: "harbour", children: [{ name: "quay", children: berths }] });
}

function io(readAgainAt?: (name: string) => ReadAgain | undefined): CliIO {
  return {
    stdout: { write: () => true },
    stderr: { write: () => true },
    readStdin: () => Promise.reject(new Error("no standard input here")),
    readFile: () => Promise.reject(new Error("read through openInput")),
    openInput: openFile,
    ...(readAgainAt ? { readAgainAt } : {}),
    env: { [LOAD_THREADS_ENV]: "1" },
  };
}

describe("fileReadAgain(name)", () => {
  it("reads the file's bytes at a position, while it is the file opened and as it was", () => {
    const file = join(dir, "ledger.json");
    writeFileSync(file, "0123456789");
    const again = fileReadAgain(file)!;
    const into = new Uint8Array(4);
    expect(again.read(into, 1, 3, 6)).toBe(3);
    // "6", "7", "8" (ASCII) after the byte left as it was.
    expect([...into]).toEqual([0, 0x36, 0x37, 0x38]);
    expect(again.unchanged()).toBe(true);
    appendFileSync(file, "x");
    expect(again.unchanged()).toBe(false);
    again.close();
    expect(again.unchanged()).toBe(false);
  });

  it("tells a file replaced under its name (same size, times set alike) from the one opened", () => {
    const file = join(dir, "manifest.json");
    writeFileSync(file, "{}");
    const again = fileReadAgain(file)!;
    const other = join(dir, "manifest.next");
    writeFileSync(other, "[]");
    renameSync(other, file);
    expect(again.unchanged()).toBe(false);
    again.close();
  });

  it("is undefined for standard input, a folder, a named pipe (not opened: no wait for a writer) or a file that is not there", () => {
    mkdirSync(join(dir, "bay"), { recursive: true });
    const fifo = join(dir, "pipe");
    if (isGnuTool("mkfifo")) {
      execFileSync("mkfifo", [fifo]);
      // Opening it for reading would block this test until a writer came.
      expect(fileReadAgain(fifo)).toBeUndefined();
    }
    expect(fileReadAgain("-")).toBeUndefined();
    expect(fileReadAgain(join(dir, "bay"))).toBeUndefined();
    expect(fileReadAgain(join(dir, "no-such.json"))).toBeUndefined();
  });
});

describe("loadVersions(io, OLD, NEW) on one thread, OLD read again", () => {
  // Files of a few KiB: kept as any size is (16 MiB and more outside tests, LEAST_KEPT_BYTES).
  beforeEach(() => {
    KeptJson.leastBytes = 0;
  });
  afterEach(() => {
    KeptJson.leastBytes = LEAST_KEPT_BYTES;
  });

  const opts = diffOptionsSchema.parse({ budget: 20 });
  const oldFile = join(dir, "old.json");
  const newFile = join(dir, "new.json");
  writeFileSync(oldFile, harbour(700));
  writeFileSync(newFile, harbour(7000));

  it("reads NEW as it reads it with OLD's bytes kept, taking nodes from OLD", async () => {
    const take = vi.spyOn(NodeSink.prototype, "take");
    const [, kept] = await loadVersions(io(), oldFile, newFile, opts);
    const keptTakes = take.mock.calls.length;
    take.mockClear();
    const reads: number[] = [];
    const [, readAgain] = await loadVersions(
      io((name) => {
        const again = fileReadAgain(name)!;
        return {
          ...again,
          read: (...args) => {
            reads.push(args[3]);
            return again.read(...args);
          },
        };
      }),
      oldFile,
      newFile,
      opts,
    );
    expect(keptTakes).toBeGreaterThan(0);
    expect(take.mock.calls.length).toBe(keptTakes);
    expect(reads.length).toBeGreaterThan(0);
    expect([...readAgain.ownSize]).toEqual([...kept.ownSize]);
    expect(readAgain.name).toEqual(kept.name);
    expect(readAgain.ownSize[2 + 700]).toBe(7000);
    take.mockRestore();
  });

  it("fails with IO when OLD changes while NEW is read against it", async () => {
    let looks = 0;
    const changing = (name: string): ReadAgain => {
      const again = fileReadAgain(name)!;
      // As it was after OLD's load, changed once NEW's is over.
      return { ...again, unchanged: () => looks++ === 0 && again.unchanged() };
    };
    let caught: unknown;
    try {
      await loadVersions(io(changing), oldFile, newFile, opts);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(EspalierError);
    expect((caught as EspalierError).code).toBe("IO");
    expect((caught as EspalierError).message).toContain("changed while the new version was read");
  });

  it("minds no change of OLD that NEW's load did not read again (an input too short to keep)", async () => {
    KeptJson.leastBytes = LEAST_KEPT_BYTES;
    let looks = 0;
    const changing = (name: string): ReadAgain => {
      const again = fileReadAgain(name)!;
      return { ...again, unchanged: () => looks++ === 0 && again.unchanged() };
    };
    const [, tree] = await loadVersions(io(changing), oldFile, newFile, opts);
    expect(tree.ownSize[2 + 700]).toBe(7000);
  });

  it("reads NEW whole when OLD changed before NEW's load began", async () => {
    const take = vi.spyOn(NodeSink.prototype, "take");
    const [, tree] = await loadVersions(
      io((name) => ({ ...fileReadAgain(name)!, unchanged: () => false })),
      oldFile,
      newFile,
      opts,
    );
    expect(take).not.toHaveBeenCalled();
    expect(tree.ownSize[2 + 700]).toBe(7000);
    take.mockRestore();
  });
});
