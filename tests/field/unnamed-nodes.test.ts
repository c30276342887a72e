import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: a mount table as its lister prints it in JSON (`{"filesystems": [...]}`, each mount a
// `target` with `children`), its array taken out, here with invented mount points. No node has a
// `name`, so every line read `""` with exit 0 and nothing on the screen said why.
const mounts = JSON.stringify([
  {
    target: "/",
    fstype: "ext4",
    children: [
      { target: "/srv/quill", fstype: "xfs" },
      { target: "/srv/tide", fstype: "xfs", children: [{ target: "/srv/tide/logs", fstype: "tmpfs" }] },
    ],
  },
]);

describe("nested nodes none of which has the name field", () => {
  it("the header says so and names the option; --name-field reads the names", async () => {
    const r = await cli(["mounts.json", "--width", "200"], { files: { "mounts.json": mounts } });
    expect(r.code).toBe(0);
    expect(r.stdout.split("\n")[0]).toBe(
      'summary: 4 nodes; no "name" field: nodes print as "" (see --name-field); no focus; 5 of 40 lines (default budget: not a terminal)',
    );
    const named = await cli(["mounts.json", "--name-field", "target", "--bare"], {
      files: { "mounts.json": mounts },
    });
    expect(named.stdout).toBe(". /  4 nodes\n  . /srv/quill\n  . /srv/tide / /srv/tide/logs  2 nodes\n");
    // A --label template chooses each line's text itself: nothing to say then.
    const label = await cli(["mounts.json", "--label", "{target}"], { files: { "mounts.json": mounts } });
    expect(label.stdout.split("\n")[0]).toBe(
      "summary: 4 nodes; no focus; 5 of 40 lines (default budget: not a terminal)",
    );
  });

  it("YAML the same; children keyed by name below a nameless top are named, so nothing is said", async () => {
    const yaml = "- target: /\n  children:\n    - target: /srv/quill\n- target: /srv/tide\n";
    const r = await cli(["mounts.yaml"], { files: { "mounts.yaml": yaml } });
    expect(r.stdout.split("\n")[0]).toMatch(/; no "name" field: nodes print as "" \(see --name-field\);/);
    // npm ls --json without --all: a nameless top whose dependencies are keyed by name.
    const keyed = '{"dependencies": {"quill-ink": {"version": "1.0.0"}, "tide-log": {"version": "2.1.0"}}}';
    const k = await cli(["deps.json", "--children-field", "dependencies"], { files: { "deps.json": keyed } });
    expect(k.stdout.split("\n")[0]).toBe(
      "summary: 3 nodes; no focus; 5 of 40 lines (default budget: not a terminal)",
    );
  });
});
