import { describe, expect, it } from "vitest";
import { loadVersions } from "../../src/cli/input.js";
import type { CliIO } from "../../src/cli/io.js";
import { LOAD_THREADS_ENV, loadThreads } from "../../src/cli/load-threads.js";
import { diffOptionsSchema } from "../../src/cli/options.js";
import { EspalierError } from "../../src/errors.js";
import { loadTree } from "../../src/load/index.js";

// The rule is the project's own (cli/load-threads.ts): common practice, no source.
describe("loadThreads", () => {
  it("loadThreads(unset, a machine with idle processors) loads on two threads", () => {
    expect(loadThreads(undefined, { cores: 2, load: 0.3 })).toBe(2);
    expect(loadThreads("", { cores: 8, load: 6.5 })).toBe(2);
  });

  it("loadThreads(unset, a machine with no second idle processor) loads on one", () => {
    expect(loadThreads(undefined, { cores: 2, load: 0.51 })).toBe(1);
    expect(loadThreads(undefined, { cores: 2, load: 7.9 })).toBe(1);
    expect(loadThreads(undefined, { cores: 1, load: 0 })).toBe(1);
  });

  it("loadThreads(unset, no reading of the machine) loads on two threads", () => {
    expect(loadThreads(undefined, undefined)).toBe(2);
  });

  it("loadThreads(1 or 2) does as told, whatever the machine", () => {
    expect(loadThreads("1", { cores: 64, load: 0 })).toBe(1);
    expect(loadThreads("2", { cores: 2, load: 9 })).toBe(2);
  });

  it("loadThreads(anything else) is a USAGE error naming the variable", () => {
    for (const bad of ["0", "3", "two", " 2"]) {
      let caught: unknown;
      try {
        loadThreads(bad, undefined);
      } catch (err) {
        caught = err;
      }
      expect(caught).toBeInstanceOf(EspalierError);
      expect((caught as EspalierError).code).toBe("USAGE");
      expect((caught as EspalierError).message).toContain(LOAD_THREADS_ENV);
    }
  });
});

describe("loadVersions(io, OLD, NEW) and the second thread", () => {
  const files: Record<string, string> = {
    "old.json": '{"name":"harbor","children":[{"name":"dock","size":3}]}',
    "new.json": '{"name":"harbor","children":[{"name":"dock","size":4}]}',
  };
  // A loader for "another thread" that records its calls and loads here as the worker would.
  const calls: string[] = [];
  const io = (env: Record<string, string>, load: number): CliIO => ({
    stdout: { write: () => true },
    stderr: { write: () => true },
    readStdin: () => Promise.reject(new Error("no standard input here")),
    readFile: (path) => Promise.resolve(Buffer.from(files[path], "utf8")),
    loadInWorker: async (name, options) => {
      calls.push(name);
      return loadTree(files[name], options);
    },
    machineLoad: () => ({ cores: 2, load }),
    env,
  });
  const opts = diffOptionsSchema.parse({});

  it("loads OLD on the worker when a second processor is idle", async () => {
    calls.length = 0;
    const [oldTree, newTree] = await loadVersions(io({}, 0.2), "old.json", "new.json", opts);
    expect(calls).toEqual(["old.json"]);
    expect(oldTree.ownSize[1]).toBe(3);
    expect(newTree.ownSize[1]).toBe(4);
  });

  it("loads both here, OLD first, when no second processor is idle or ESPALIER_LOAD_THREADS=1", async () => {
    for (const [env, load] of [
      [{}, 1.2],
      [{ [LOAD_THREADS_ENV]: "1" }, 0],
    ] as const) {
      calls.length = 0;
      const [oldTree, newTree] = await loadVersions(io(env, load), "old.json", "new.json", opts);
      expect(calls).toEqual([]);
      expect(oldTree.ownSize[1]).toBe(3);
      expect(newTree.ownSize[1]).toBe(4);
    }
  });

  it("rejects a bad ESPALIER_LOAD_THREADS before loading anything", async () => {
    calls.length = 0;
    await expect(
      loadVersions(io({ [LOAD_THREADS_ENV]: "many" }, 0), "old.json", "new.json", opts),
    ).rejects.toMatchObject({ code: "USAGE" });
    expect(calls).toEqual([]);
  });
});
