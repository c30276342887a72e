import { execFileSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

/** Standard output of a command, or undefined where the machine has no such command. */
function output(cmd: string, args: string[]): string | undefined {
  try {
    return execFileSync(cmd, args, { encoding: "utf8", stdio: ["ignore", "pipe", "ignore"] });
  } catch {
    return undefined;
  }
}

// Field tests: a mount table saved or piped in, invented devices and folders in the three layouts
// Linux writes (util-linux mount and /proc/mounts seen here; fstab(5) and proc(5) for fstab and
// mountinfo). Detected as a path list, each whole line was one path split at the folder's "/"s,
// device, type and options in the names, exit 0 (20 mounts here read as 44 nodes).
const mountOutput = [
  "tidefs on / type ext4 (rw,relatime)",
  "quayproc on /proc type proc (rw,nosuid,nodev,noexec,relatime)",
  "berthtmp on /srv/harbour/berths type tmpfs (rw,size=65536k)",
  "",
].join("\n");
const procMounts = [
  "tidefs / ext4 rw,relatime 0 0",
  "quayproc /proc proc rw,nosuid,nodev,noexec,relatime 0 0",
  "berthtmp /srv/harbour/berths tmpfs rw,size=65536k 0 0",
  "",
].join("\n");
const fstab = [
  "# harbour-ops: static file systems",
  "LABEL=tide\t/\text4\tdefaults\t0\t1",
  "LABEL=ledger\t/srv/ledger\text4\tdefaults,noatime\t0\t2",
  "",
].join("\n");
const mountinfo = [
  "22 27 0:21 / /proc rw,relatime shared:12 - proc quayproc rw",
  "27 1 254:0 / / rw,relatime shared:1 - ext4 /dev/tide rw",
  "31 27 0:30 / /srv/harbour/berths rw - tmpfs berthtmp rw,size=65536k",
  "",
].join("\n");

describe("a mount table detected as a path list", () => {
  it.each([
    ["mount", mountOutput],
    ["/proc/mounts", procMounts],
    ["/etc/fstab", fstab],
    ["/proc/self/mountinfo", mountinfo],
  ])("as %s lists it is PARSE_PATHS at line 1 naming findmnt -J", async (_, text) => {
    const r = await cli(["-"], { stdin: text });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: every line is a mounted file system.*findmnt -J \| espalier - --start-at \/filesystems --name-field target.*--input-format paths \[PARSE_PATHS\]\n$/,
    );
  });

  it("is PARSE_PATHS, not DUPLICATE_PATH, where a line repeats (a file system mounted twice)", async () => {
    const twice = `${procMounts}berthpts /srv/pts devpts rw 0 0\nberthpts /srv/pts devpts rw 0 0\n`;
    const r = await cli(["-"], { stdin: twice });
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: every line is a mounted file system.*\[PARSE_PATHS\]\n$/,
    );
  });

  it("reads each line as a path under --input-format paths, and a list with one such line", async () => {
    const asked = await cli(["-", "--input-format", "paths", "--format", "json"], { stdin: procMounts });
    expect(asked.code).toBe(0);
    // Split at "/": "tidefs " + " ext4 …"; "quayproc " + "proc …"; "berthtmp " + "srv" + "harbour" +
    // "berths …": 2 + 2 + 4 nodes under the root espalier adds for the three top names.
    expect(JSON.parse(asked.stdout).totals.nodes).toBe(9);
    const one = await cli(["-", "--bare"], { stdin: "quay/berth 7 on /dock (north)\nquay/ledger.txt\n" });
    expect(one.code).toBe(0);
  });

  it.skipIf(!existsSync("/proc/mounts"))("the machine's own /proc/mounts is PARSE_PATHS", async () => {
    const text = readFileSync("/proc/mounts", "utf8");
    const r = await cli(["-"], { stdin: text });
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: every line is a mounted file system.*\[PARSE_PATHS\]\n$/,
    );
  });

  const findmntJson = output("findmnt", ["-J"]);
  it.skipIf(findmntJson === undefined || !existsSync("/proc/self/mountinfo"))(
    "the command the message names reads the machine's mounts, one node each",
    async () => {
      const r = await cli(["-", "--start-at", "/filesystems", "--name-field", "target", "--format", "json"], {
        stdin: findmntJson!,
      });
      expect(r.stderr).toBe("");
      const doc = JSON.parse(r.stdout);
      // Source: proc(5), /proc/self/mountinfo holds one line per mount, which findmnt reads (util-linux).
      const mounts = readFileSync("/proc/self/mountinfo", "utf8").trim().split("\n").length;
      expect(doc.totals.nodes).toBe(mounts);
      expect(doc.root.name).toBe("/");
    },
  );

  const findmntText = output("findmnt", []);
  it.skipIf(findmntText === undefined)(
    "findmnt's own listing is PARSE_PATHS naming findmnt -J, not a conversion from ps",
    async () => {
      const r = await cli(["-"], { stdin: findmntText! });
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/^espalier: <stdin>:1:1: .*findmnt -J \|.*\[PARSE_PATHS\]\n$/);
      expect(r.stderr).not.toContain("ps -eo");
    },
  );
});
