import { describe, expect, it } from "vitest";
import type { CliIO } from "../../src/cli/io.js";
import { readInput } from "../../src/cli/read-input.js";

/** An IO whose standard input holds `bytes`. */
function stdinOf(bytes: Buffer): CliIO {
  return {
    stdout: { write: () => true },
    stderr: { write: () => true },
    readStdin: async () => bytes,
    readFile: async () => Buffer.alloc(0),
    env: {},
  };
}

describe("readInput(io, name)", () => {
  const text = "quill/caf\u00e9\ntidewater/\u{1FAB6}\n";
  const le = Buffer.from(`\ufeff${text}`, "utf16le");

  it("decodes UTF-8, with or without a byte-order mark, and drops the mark", async () => {
    expect(await readInput(stdinOf(Buffer.from(text, "utf8")), "-")).toBe(text);
    expect(await readInput(stdinOf(Buffer.from(`\ufeff${text}`, "utf8")), "-")).toBe(text);
  });

  it("decodes UTF-16LE (FF FE) and UTF-16BE (FE FF) by their byte-order mark, and drops the mark", async () => {
    expect([...le.subarray(0, 2)]).toEqual([0xff, 0xfe]);
    expect(await readInput(stdinOf(le), "-")).toBe(text);
    const be = Buffer.from(le).swap16();
    expect([...be.subarray(0, 2)]).toEqual([0xfe, 0xff]);
    expect(await readInput(stdinOf(be), "-")).toBe(text);
  });

  it("turns a UTF-16 code unit cut off at the end into U+FFFD", async () => {
    expect(await readInput(stdinOf(Buffer.concat([le, Buffer.from([0x61])])), "-")).toBe(`${text}\ufffd`);
  });
});
