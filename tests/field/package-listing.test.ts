import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: a dependency listing shaped as `npm ls --all --json` prints it (checked against the
// output of npm 10 on this project: children under "dependencies", keyed by package name, a scoped
// name holding "/", and a dependency that is not installed -- an optional one for another platform --
// written as an empty object `{}`), reduced to the invented tidewater packages.
const listing = JSON.stringify({
  version: "4.2.0",
  name: "tidewater",
  dependencies: {
    "@tidewater/ledger": {
      version: "1.3.0",
      dependencies: {
        "@tidewater/ledger-darwin-arm64": {},
        "@tidewater/ledger-linux-x64": { version: "1.3.0" },
        "@tidewater/ledger-win32-x64": {},
      },
    },
    "brackish-streams": {
      version: "0.9.1",
      dependencies: { "tidal-math": { version: "2.0.0" } },
    },
  },
});

describe("a glob focus with a scoped name typed unescaped", () => {
  it("matches nothing and suggests the glob with the scope escaped as ~1 (RFC 6901, section 3)", async () => {
    const result = await cli(["-", "--focus", "@tidewater/ledger/*"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('did you mean "@tidewater~1ledger/*"?');
  });

  it("suggests the escaped form below a ** too, and the suggestion matches when typed", async () => {
    const typed = await cli(["-", "--focus", "**/@tidewater/ledger/*linux*"], { stdin: listing });
    expect(typed.stderr).toContain('did you mean "**/@tidewater~1ledger/*linux*"?');
    const result = await cli(["-", "--focus", "**/@tidewater~1ledger/*linux*", "--format", "json"], {
      stdin: listing,
    });
    expect(result.code).toBe(0);
    expect(JSON.parse(result.stdout).foci).toEqual(["@tidewater~1ledger/@tidewater~1ledger-linux-x64"]);
  });

  it("offers no joined glob when no join matches (a glob of unrelated names stays without it)", async () => {
    const result = await cli(["-", "--focus", "harbor/quay/*"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stderr).not.toContain("~1");
  });
});
