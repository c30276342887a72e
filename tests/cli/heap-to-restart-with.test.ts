import { describe, expect, it } from "vitest";
import { heapToRestartWith } from "../../src/cli/heap-to-restart-with.js";

const GiB = 2 ** 30;
const MiB = 2 ** 20;

describe("heapToRestartWith", () => {
  it("heapToRestartWith(small inputs) keeps the engine's default heap", () => {
    expect(heapToRestartWith({ heapLimit: 2 * GiB, totalMemory: 8 * GiB, inputBytes: [40 * MiB] })).toBe(0);
    expect(heapToRestartWith({ heapLimit: 2 * GiB, totalMemory: 8 * GiB, inputBytes: [] })).toBe(0);
  });

  it("heapToRestartWith(an input too big for the heap) asks for more, up to three quarters of memory", () => {
    expect(heapToRestartWith({ heapLimit: 2 * GiB, totalMemory: 64 * GiB, inputBytes: [400 * MiB] })).toBe(
      6656,
    );
    expect(heapToRestartWith({ heapLimit: 2 * GiB, totalMemory: 8 * GiB, inputBytes: [1024 * MiB] })).toBe(
      6144,
    );
    // No room to grow: run as is.
    expect(heapToRestartWith({ heapLimit: 4 * GiB, totalMemory: 4 * GiB, inputBytes: [1024 * MiB] })).toBe(0);
  });

  it("heapToRestartWith(a pipe) assumes ten million nodes may come", () => {
    expect(heapToRestartWith({ heapLimit: 1 * GiB, totalMemory: 16 * GiB, inputBytes: [undefined] })).toBe(
      4352,
    );
    expect(heapToRestartWith({ heapLimit: 4.5 * GiB, totalMemory: 16 * GiB, inputBytes: [undefined] })).toBe(
      0,
    );
  });

  it("heapToRestartWith(a fact table the SQL engine rolls up) never restarts, whatever its size", () => {
    const big = { heapLimit: 2 * GiB, totalMemory: 64 * GiB, inputBytes: [2048 * MiB] };
    expect(heapToRestartWith({ ...big, args: ["inv.parquet", "--key-field", "key"] })).toBe(0);
    expect(heapToRestartWith({ ...big, args: ["costs.csv", "--levels=account,service"] })).toBe(0);
    // A rolled-up result becomes a tree in the heap, a node per row: sized as any table.
    expect(heapToRestartWith({ ...big, args: ["r.csv", "--rolled-up", "--levels", "a"] })).toBe(33024);
    expect(heapToRestartWith({ ...big, args: ["org.csv", "--parent-field", "manager"] })).toBe(33024);
  });
});
