import { describe, expect, it } from "vitest";
import type { CliIO } from "../../src/cli/io.js";
import { progressLine, withProgress } from "../../src/cli/progress.js";

function fakeIO(tty: boolean, times: number[]): { io: CliIO; err: () => string } {
  let err = "";
  let k = 0;
  const io: CliIO = {
    stdout: { write: () => true },
    stderr: { write: (s: string) => (err += s), isTTY: tty },
    readStdin: async () => Buffer.alloc(0),
    readFile: async () => Buffer.alloc(0),
    now: () => times[Math.min(k++, times.length - 1)],
    env: {},
  };
  return { io, err: () => err };
}

async function drain(chunks: AsyncIterable<Uint8Array>): Promise<number> {
  let bytes = 0;
  for await (const chunk of chunks) bytes += chunk.length;
  return bytes;
}

async function* source(count: number, size: number) {
  for (let k = 0; k < count; k++) yield new Uint8Array(size);
}

describe("withProgress", () => {
  it("withProgress(chunks) shows bytes read and rate after a second on a terminal, then erases the line", async () => {
    // Clock: start at 0, then one reading per chunk.
    const { io, err } = fakeIO(true, [0, 200, 1200, 1300, 1600, 2000]);
    expect(await drain(withProgress(source(5, 2 ** 20), io, "big.json", 5 * 2 ** 20))).toBe(5 * 2 ** 20);
    const shown = err()
      .split("\r\x1b[K")
      .filter((s) => s !== "");
    expect(shown).toEqual([
      "espalier: reading big.json: 2 MiB of 5 MiB (40%), 2 MiB/s",
      "espalier: reading big.json: 4 MiB of 5 MiB (80%), 3 MiB/s",
      "espalier: reading big.json: 5 MiB of 5 MiB (100%), 3 MiB/s",
    ]);
    expect(err().endsWith("\r\x1b[K")).toBe(true);
  });

  it("withProgress(chunks) prints nothing when standard error is not a terminal or the load is quick", async () => {
    const slow = fakeIO(false, [0, 5000, 10000]);
    await drain(withProgress(source(3, 10), slow.io, "x", 30));
    expect(slow.err()).toBe("");
    const quick = fakeIO(true, [0, 10, 20, 30]);
    await drain(withProgress(source(3, 10), quick.io, "x", 30));
    expect(quick.err()).toBe("");
  });

  it("progressLine(read, unknown total) gives the bytes and the rate only", () => {
    expect(progressLine("<stdin>", 3 * 2 ** 30, undefined, 10_000)).toBe(
      "espalier: reading <stdin>: 3.0 GiB, 307 MiB/s",
    );
  });
});
