import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: a path list whose sizes were converted to KiB with fractions (awk '{print $1 / 1024 "\t"
// $2}', invented harbour files). Read as bytes, it printed "1.5 B": no byte count has a fraction.
describe("a path list with a size that is no whole number", () => {
  it("reads every size as a plain number, printed without byte units", async () => {
    const listing = "1.5\tharbour/tide.csv\n12\tharbour/berths.json\n0.25\tharbour/README\n";
    const json = JSON.parse((await cli(["-", "--format", "json"], { stdin: listing })).stdout);
    expect(json.input.sizeUnit).toBe("number");
    expect(json.totals.size).toBe(13.75);
    const text = await cli(["-", "--bare"], { stdin: listing });
    expect(text.stdout).toContain("tide.csv  1.5\n");
    expect(text.stdout).not.toMatch(/\d B\b/);
  });

  it("keeps bytes for whole sizes, and --units bytes prints byte units as asked", async () => {
    const whole = JSON.parse((await cli(["-", "--format", "json"], { stdin: "2\ta\n3\tb\n" })).stdout);
    expect(whole.input.sizeUnit).toBe("bytes");
    const asked = await cli(["-", "--bare", "--units", "bytes"], { stdin: "1.5\ta\n3\tb\n" });
    expect(asked.stdout).toContain("1.5 B");
  });
});
