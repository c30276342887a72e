import { expect } from "vitest";
import type { CliResult } from "../helpers/cli.js";

/** The parts of the one error line `espalier: [FILE:LINE:COL: ]message [CODE]`. */
export interface ErrorLine {
  code: string;
  file?: string;
  line?: number;
  column?: number;
}

/**
 * Checks the contract of a failed run (exit 2, nothing on standard output, exactly one line on standard
 * error, no stack trace) and returns the position and code the line names. The message's wording is
 * never looked at.
 */
export function oneErrorLine(r: CliResult): ErrorLine {
  expect(r.code, r.stderr).toBe(2);
  expect(r.stdout).toBe("");
  expect(r.stderr.endsWith("\n")).toBe(true);
  expect(r.stderr.slice(0, -1)).not.toMatch(/[\n\r]/);
  expect(r.stderr).not.toMatch(/\n\s+at /);
  const text = r.stderr.slice(0, -1);
  const code = /\[([A-Z_]+)\]$/.exec(text)?.[1];
  expect(code, text).toBeDefined();
  const out: ErrorLine = { code: code! };
  // No second position after the first ("row 3: row 3" once printed a row twice).
  expect(text).not.toMatch(/^espalier: [^:]*: row \d+: /);
  const lineCol = /^espalier: ([^:]*?):(\d+)(?::(\d+))?: /.exec(text);
  if (lineCol) {
    out.file = lineCol[1];
    out.line = Number(lineCol[2]);
    if (lineCol[3] !== undefined) out.column = Number(lineCol[3]);
  } else {
    const file = /^espalier: ([^:]+): /.exec(text);
    if (file) out.file = file[1];
  }
  return out;
}
