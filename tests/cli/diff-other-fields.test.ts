import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const head = (stdout: string) => stdout.split("\n")[0];

// An invented deployment of a fictional harbour-logistics company: services listed in YAML with the
// fields a deployment file carries beside their names.
const services = (ledgerImage: string, extra = "") => `name: harbour-ops
children:
  - name: ledger-api
    image: registry.example/ledger:${ledgerImage}
    replicas: 3
    labels: {tier: back}
  - name: invoice-ui
    image: registry.example/invoice:0.9
    replicas: 1${extra}
`;

describe("espalier diff compares the records' other fields when they have no version", () => {
  it("sees a changed image tag in a list of services, and fails on it", async () => {
    const files = { "old.yaml": services("1.4"), "new.yaml": services("1.5") };
    const r = await cli(["diff", "old.yaml", "new.yaml", "--fail-on-change"], { files });
    // main's build said "0 edited (no field compared)" and exited 0 here: the versions differ.
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: image, replicas, labels)");
    expect(r.stdout).toContain(
      "[edited image registry.example/ledger:1.4 -> registry.example/ledger:1.5] ledger-api",
    );
    expect(r.stderr).toBe("");
    const same = await cli(["diff", "old.yaml", "old.yaml", "--fail-on-change"], { files });
    expect(same.code).toBe(0);
    expect(head(same.stdout)).toContain("0 edited (compared: image, replicas, labels)");
  });

  it("counts a field only NEW's records have as an edit where it holds something", async () => {
    const files = { "old.yaml": services("1.4"), "new.yaml": services("1.4", "\n    owner: quay-team") };
    const r = await cli(["diff", "old.yaml", "new.yaml", "--fail-on-change", "--format", "json"], { files });
    expect(r.code).toBe(1);
    const out = JSON.parse(r.stdout);
    expect(out.compared).toEqual(["image", "replicas", "labels", "owner"]);
    expect(out.changes.edited).toBe(1);
    const ui = out.root.children.find((c: { name: string }) => c.name === "invoice-ui");
    expect(ui.edits).toEqual([{ field: "owner", old: "", new: "quay-team" }]);
  });

  it("compares a table's other columns, and --compare-field still names the only ones compared", async () => {
    const old = "id,parent,name,title\nt1,,Harbour board,board\nt2,t1,Quay crew,crew\n";
    const files = { "old.csv": old, "new.csv": old.replace("Quay crew,crew", "Quay crew,night crew") };
    const r = await cli(["diff", "old.csv", "new.csv", "--fail-on-change"], { files });
    expect(r.code).toBe(1);
    expect(r.stdout).toContain("[edited title crew -> night crew] Quay crew");
    const named = await cli(["diff", "old.csv", "new.csv", "--fail-on-change", "--compare-field", "name"], {
      files,
    });
    expect(named.code).toBe(0);
    expect(head(named.stdout)).toContain("0 edited (compared: name)");
  });

  it("hides the compared values with --pseudonymize", async () => {
    const old =
      "id,parent,name,email\np1,,Wren Calder,wren@harbour.example\np2,p1,Ines Vale,ines@harbour.example\n";
    const files = { "old.csv": old, "new.csv": old.replace("ines@", "ines.vale@") };
    const r = await cli(["diff", "old.csv", "new.csv", "--pseudonymize"], {
      files,
      env: { ESPALIER_PSEUDONYM_KEY: "test-secret" },
    });
    expect(r.code).toBe(0);
    expect(head(r.stdout)).toContain("1 edited (compared: email)");
    expect(r.stdout).not.toMatch(/harbour\.example|Wren|Ines/);
  });

  it("compares the fields of a version from standard input by the other version's file", async () => {
    const files = { "old.yaml": services("1.4") };
    // As a CI step pipes the base branch's copy: git show main:deploy.yaml | espalier diff - deploy.yaml
    const r = await cli(["diff", "-", "old.yaml", "--fail-on-change"], { files, stdin: services("1.5") });
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: image, replicas, labels)");
    expect(r.stderr).toBe("");
    const back = await cli(["diff", "old.yaml", "-", "--fail-on-change"], { files, stdin: services("1.5") });
    expect(back.code).toBe(1);
  });

  it("compares a column only standard input's table has: it keeps its own, read once", async () => {
    const old = "id,parent,name\nt1,,Harbour board\nt2,t1,Quay crew\nt3,t1,Night crew\n";
    const piped = "id,parent,name,team\nt1,,Harbour board,\nt2,t1,Quay crew,quay\nt3,t1,Night crew,\n";
    const r = await cli(["diff", "old.csv", "-", "--fail-on-change"], {
      files: { "old.csv": old },
      stdin: piped,
    });
    // main's build said "0 edited (no field compared)", exit 0, and FIELDS_NOT_COMPARED here.
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: team)");
    expect(r.stdout).toContain("[edited team (none) -> quay] Quay crew");
    expect(r.stderr).toBe("");
    const back = await cli(["diff", "-", "old.csv", "--format", "json"], {
      files: { "old.csv": old },
      stdin: piped,
    });
    const out = JSON.parse(back.stdout);
    expect(out.compared).toEqual(["team"]);
    expect(out.changes.edited).toBe(1);
  });

  it("compares JSON rows' field only standard input's rows have", async () => {
    const rows = (team?: string) =>
      JSON.stringify([
        { id: "t1", parent: null, name: "Harbour board" },
        { id: "t2", parent: "t1", name: "Quay crew", ...(team ? { team } : {}) },
      ]);
    const r = await cli(["diff", "old.json", "-", "--fail-on-change"], {
      files: { "old.json": rows() },
      stdin: rows("quay"),
    });
    expect(r.code).toBe(1);
    expect(r.stdout).toContain("[edited team (none) -> quay] Quay crew");
    expect(r.stderr).toBe("");
  });

  it("reads each version's table once to compare its other columns", async () => {
    const old = "id,parent,name,title\nt1,,Harbour board,board\nt2,t1,Quay crew,crew\n";
    const reads: Record<string, number> = {};
    const contents: Record<string, string> = {
      "old.csv": old,
      "new.csv": old.replace("Quay crew,crew", "Quay crew,night crew"),
    };
    // Counts the reads of each file the run makes.
    const files = new Proxy(contents, {
      get(target, key: string) {
        reads[key] = (reads[key] ?? 0) + 1;
        return target[key];
      },
    });
    const r = await cli(["diff", "old.csv", "new.csv"], { files });
    expect(r.stdout).toContain("[edited title crew -> night crew] Quay crew");
    // main's build read each twice: once to find the other columns, once keeping them.
    expect(reads).toEqual({ "old.csv": 1, "new.csv": 1 });
  });

  it("compares a field only standard input's node objects hold: it keeps its own", async () => {
    const files = { "old.yaml": services("1.4") };
    const r = await cli(["diff", "old.yaml", "-", "--fail-on-change"], {
      files,
      stdin: services("1.4", "\n    owner: quay-team"),
    });
    // main's build compared image, replicas and labels only, exit 0, with FIELDS_NOT_COMPARED for owner.
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: image, replicas, labels, owner)");
    expect(r.stdout).toContain("[edited owner (none) -> quay-team] invoice-ui");
    expect(r.stderr).toBe("");
    const json = JSON.stringify({
      name: "harbour-ops",
      children: [{ name: "ledger-api", image: "registry.example/ledger:1.4" }],
    });
    const piped = await cli(["diff", "-", "old.json", "--fail-on-change"], {
      files: { "old.json": json },
      stdin: json.replace('"image"', '"owner":"quay-team","image"'),
    });
    expect(piped.code).toBe(1);
    expect(piped.stdout).toContain("[edited owner quay-team -> (none)] ledger-api");
  });

  it("says on standard error which fields past the most kept it did not compare", async () => {
    // 45 fields beside the name: 40 are kept and compared, the last 5 are not.
    const record = (last: string) =>
      Object.fromEntries(Array.from({ length: 45 }, (_, k) => [`f${k}`, k === 44 ? last : "v"]));
    const doc = (last: string) =>
      JSON.stringify({ name: "harbour-ops", children: [{ name: "quay", ...record(last) }] });
    const r = await cli(["diff", "old.json", "new.json", "--fail-on-change", "--format", "json"], {
      files: { "old.json": doc("1"), "new.json": doc("2") },
    });
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.compared).toHaveLength(40);
    expect(out.compared.at(-1)).toBe("f39");
    expect(r.stderr).toContain('("f40", "f41", "f42", "f43", "f44")');
    expect(r.stderr).toContain("[FIELDS_NOT_COMPARED]");
    const named = await cli(["diff", "old.json", "new.json", "--fail-on-change", "--compare-field", "f44"], {
      files: { "old.json": doc("1"), "new.json": doc("2") },
    });
    expect(named.code).toBe(1);
  });
});
