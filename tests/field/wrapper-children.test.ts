import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: a mount table as its lister prints it in JSON wraps the mounts in one field
// (`{"filesystems": [...]}`), and each mount holds its own under `children` (invented mount points
// here). Naming the wrapper as the children field read the top level only: 2 nodes, exit 0, every
// mount below the first dropped without a word.
const table = JSON.stringify(
  {
    filesystems: [
      {
        target: "/",
        children: [
          { target: "/srv/quill" },
          { target: "/srv/tide", children: [{ target: "/srv/tide/logs" }] },
        ],
      },
    ],
  },
  null,
  1,
);

describe("a children field that wraps the top level only", () => {
  it("is FIELD_MISSING at the first unread children, naming how to take the wrapper off", async () => {
    const r = await cli(["mounts.json", "--children-field", "filesystems", "--name-field", "target"], {
      files: { "mounts.json": table },
    });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: mounts\.json:5:16: the children field "filesystems" holds only the top level, while nodes below hold an object or array under "children" .*--start-at \/filesystems.*\[FIELD_MISSING\]\n$/,
    );
    // Taken out, the mounts read with the default children field: all 4.
    const out = JSON.stringify(JSON.parse(table).filesystems);
    const ok = await cli(["-", "--name-field", "target", "--bare"], { stdin: out });
    expect(ok.stdout).toBe(". /  4 nodes\n  . /srv/quill\n  . /srv/tide / /srv/tide/logs  2 nodes\n");
  });

  it("YAML the same, at the first unread children, naming the value to take out", async () => {
    const yaml = "filesystems:\n  - target: /\n    children:\n      - target: /srv/quill\n";
    const r = await cli(["mounts.yaml", "--children-field", "filesystems", "--name-field", "target"], {
      files: { "mounts.yaml": yaml },
    });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /^espalier: mounts\.yaml:4:7: the children field "filesystems" holds only the top level, while nodes below hold a mapping or sequence under "children" .*--start-at \/filesystems.*\[FIELD_MISSING\]\n$/,
    );
    // As the message says: the wrapped nodes read alone, each mount's own under "children".
    const alone = await cli(
      ["mounts.yaml", "--start-at", "/filesystems", "--name-field", "target", "--bare"],
      {
        files: { "mounts.yaml": yaml },
      },
    );
    expect(alone.stdout).toBe(". //srv/quill  2 nodes\n");
  });

  it("a tree that uses the field below the top, or a scalar named children, reads as before", async () => {
    const deep = '{"name": "r", "kids": [{"name": "a", "kids": [{"name": "x", "children": [1]}]}]}';
    const r = await cli(["-", "--children-field", "kids", "--bare"], { stdin: deep });
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(". r / a / x  3 nodes\n");
    const count = '{"name": "r", "kids": [{"name": "a", "children": 3}, {"name": "b"}]}';
    const c = await cli(["-", "--children-field", "kids", "--bare"], { stdin: count });
    expect(c.code).toBe(0);
    expect(c.stdout).toBe(". r  3 nodes\n  . a\n  . b\n");
  });
});
