import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

/** What `lsblk ARGS` prints, or undefined where it is missing or lists no device. */
function lsblk(args: string[]): string | undefined {
  try {
    const out = execFileSync("lsblk", args, { encoding: "utf8", stdio: ["ignore", "pipe", "ignore"] });
    return out.includes('"blockdevices"') ? out : undefined;
  } catch {
    return undefined;
  }
}

const human = lsblk(["-J"]);
const bytes = lsblk(["-J", "-b"]);

// Field test: sizes written as text with a unit in a document. `lsblk -J` writes each size so
// ("256G", "0B"; util-linux, seen here), `lsblk -J -b` in bytes as numbers. Read as node objects, the
// text was BAD_SIZE with nothing said of the unit. Invented sizes: a ferry operator's fleet.
describe("a document whose sizes are text with a unit", () => {
  it("is BAD_SIZE saying sizes are plain numbers, in JSON and YAML", async () => {
    const json = await cli(["-", "--input-format", "json"], {
      stdin: '{"name":"fleet","children":[{"name":"tug","size":"1.5GiB"}]}',
    });
    expect(json.code).toBe(2);
    expect(json.stderr).toMatch(
      /got "1\.5GiB"; sizes are plain numbers, not text with a unit.*\[BAD_SIZE\]\n$/,
    );
    const yaml = await cli(["-", "--input-format", "yaml", "--read-as", "nodes"], {
      stdin: "name: fleet\nsize: 12 KB\n",
    });
    expect(yaml.stderr).toMatch(/got "12 KB"; sizes are plain numbers.*\[BAD_SIZE\]\n$/);
    // A size that is text of another kind is not said to have a unit.
    const other = await cli(["-", "--input-format", "json"], { stdin: '{"name":"fleet","size":"large"}' });
    expect(other.stderr).toMatch(/got "large" \[BAD_SIZE\]\n$/);
  });

  it.skipIf(human === undefined)("lsblk -J is BAD_SIZE naming lsblk -J -b", async () => {
    const r = await cli(["-", "--start-at", "/blockdevices", "--read-as", "nodes"], { stdin: human });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/lsblk -J -b.*\[BAD_SIZE\]\n$/);
  });

  it.skipIf(bytes === undefined)(
    "lsblk -J -b is read, at the sum of the top-level devices' sizes",
    async () => {
      // Source: lsblk's own byte sizes; a device's size includes its partitions (--folder-sizes total).
      const devices = JSON.parse(bytes as string).blockdevices as { size: number }[];
      const r = await cli(
        [
          "-",
          "--start-at",
          "/blockdevices",
          "--read-as",
          "nodes",
          "--folder-sizes",
          "total",
          "--format",
          "json",
        ],
        {
          stdin: bytes,
        },
      );
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).totals.size).toBe(devices.reduce((s, d) => s + d.size, 0));
    },
  );
});
