import { describe, expect, it } from "vitest";
import { columnsOf } from "../../src/cli/output-settings.js";
import { displayWidth } from "../../src/render/display-width.js";
import { cli } from "../helpers/cli.js";

// POSIX.1-2017, XBD chapter 8.3 (Other Environment Variables): COLUMNS is "a decimal integer > 0 used
// to indicate the user's preferred width in column positions for the terminal screen or window"; if
// it is set, programs use it in place of the width the terminal gives; other values are unspecified.
const args = ["fixtures/tidewater-files.paths", "--budget", "14"];
const widest = (text: string) => Math.max(...text.trimEnd().split("\n").map(displayWidth));

describe("COLUMNS", () => {
  it("reads only a decimal integer above 0", () => {
    expect(columnsOf("80")).toBe(80);
    expect(columnsOf("040")).toBe(40);
    for (const other of [undefined, "", "0", "-80", "80x", " 80", "8e1", "0x50", "80.0"])
      expect(columnsOf(other)).toBeUndefined();
  });

  it("sets the width when printing to a pipe, where there is no limit without it", async () => {
    const free = await cli(args);
    expect(widest(free.stdout)).toBeGreaterThan(60);
    const narrow = await cli(args, { env: { COLUMNS: "60" } });
    expect(narrow.code).toBe(0);
    expect(widest(narrow.stdout)).toBeLessThanOrEqual(60);
    // The same screen --width 60 prints.
    expect(narrow.stdout).toBe((await cli([...args, "--width", "60"])).stdout);
  });

  it("takes the place of the terminal's width, and --width takes the place of both", async () => {
    // NO_COLOR: a terminal gets colours otherwise (no-color.org), which the pipe's output has not.
    const tty = { rows: 30, columns: 120 };
    const terminal = await cli(args, { tty, env: { NO_COLOR: "1" } });
    expect(terminal.stdout).toBe((await cli([...args, "--width", "120"])).stdout);
    const asked = await cli(args, { tty, env: { COLUMNS: "50", NO_COLOR: "1" } });
    expect(asked.stdout).toBe((await cli([...args, "--width", "50"])).stdout);
    const option = await cli([...args, "--width", "90"], { tty, env: { COLUMNS: "50", NO_COLOR: "1" } });
    expect(option.stdout).toBe((await cli([...args, "--width", "90"])).stdout);
  });

  it("is ignored when it is not a whole number above 0, and under 30 is taken as 30", async () => {
    const free = (await cli(args)).stdout;
    for (const other of ["", "wide", "0"])
      expect((await cli(args, { env: { COLUMNS: other } })).stdout).toBe(free);
    const least = await cli(args, { env: { COLUMNS: "12" } });
    expect(least.code).toBe(0);
    expect(least.stdout).toBe((await cli([...args, "--width", "30"])).stdout);
  });

  it("leaves JSON's nodes as the text of the same width shows them", async () => {
    const json = await cli([...args, "--format", "json"], { env: { COLUMNS: "40" } });
    const text = await cli(args, { env: { COLUMNS: "40" } });
    const lines = text.stdout.trimEnd().split("\n").length;
    expect(JSON.parse(json.stdout).lines).toBe(lines);
  });
});
