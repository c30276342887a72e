import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const head = (stdout: string) => stdout.split("\n")[0];

// A CycloneDX 1.5 SBOM (ECMA-424; CycloneDX 1.x specification, component fields: bom-ref, name,
// version, hashes [{alg, content}], licenses [{license: {id}} or {expression}], purl) of the fictional
// Tidewater Freight's dispatch service: three packages, one of them required by two others.
function sbom(change: (components: Record<string, unknown>[]) => void = () => {}) {
  const pkg = (name: string, version: string, hash: string) => ({
    type: "library",
    "bom-ref": `pkg:npm/${name}@${version}`,
    name,
    version,
    hashes: [{ alg: "SHA-256", content: hash.repeat(64) }],
    licenses: [{ license: { id: "MIT" } }],
    purl: `pkg:npm/${name}@${version}`,
  });
  const components = [
    pkg("manifest-core", "2.0.1", "a"),
    pkg("route-plan", "1.3.0", "b"),
    pkg("quay-log", "0.4.2", "c"),
  ];
  change(components);
  return JSON.stringify({
    bomFormat: "CycloneDX",
    specVersion: "1.5",
    serialNumber: "urn:uuid:11111111-2222-4333-8444-555555555555",
    version: 1,
    metadata: {
      timestamp: "2026-11-30T08:00:00Z",
      component: { type: "application", "bom-ref": "dispatch", name: "tidewater-dispatch", version: "5.0.0" },
    },
    components,
    dependencies: [
      { ref: "dispatch", dependsOn: components.slice(0, 2).map((c) => c["bom-ref"]) },
      { ref: components[0]["bom-ref"], dependsOn: [components[2]["bom-ref"]] },
      { ref: components[1]["bom-ref"], dependsOn: [components[2]["bom-ref"]] },
      { ref: components[2]["bom-ref"] },
    ],
  });
}

async function diff(oldText: string, newText: string, ext: string, ...more: string[]) {
  return cli(["diff", `old.${ext}`, `new.${ext}`, "--fail-on-change", ...more], {
    files: { [`old.${ext}`]: oldText, [`new.${ext}`]: newText },
  });
}

describe("espalier diff OLD NEW of two CycloneDX SBOMs compares every component field but bom-ref", () => {
  it("sees a hash changed at the same version, once, on the component's full entry", async () => {
    const r = await diff(
      sbom(),
      sbom((c) => {
        c[2].hashes = [{ alg: "SHA-256", content: "d".repeat(64) }];
      }),
      "cdx.json",
    );
    // main's build said "0 edited (compared: version)" and exited 0 here.
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: version, type, hashes and 2 other fields)");
    // quay-log has a full entry and a reference line; the reference line shows no edit of its own.
    expect(r.stdout.match(/\[edited hashes /g)).toHaveLength(1);
    expect(r.stdout).toContain(`[edited hashes [{"alg":"SHA-256","content":"${"c".repeat(64)}"}] -> [{`);
  });

  it("sees a license or a purl changed at the same version, and lists what it compared in JSON", async () => {
    const r = await diff(
      sbom(),
      sbom((c) => {
        c[0].licenses = [{ expression: "GPL-3.0-only" }];
        c[1].purl = "pkg:npm/route-plan@1.3.0?repository_url=https://mirror.example";
      }),
      "cdx.json",
      "--format",
      "json",
    );
    expect(r.code).toBe(1);
    const out = JSON.parse(r.stdout);
    expect(out.compared).toEqual(["version", "type", "hashes", "licenses", "purl"]);
    expect(out.changes.edited).toBe(2);
    const [core, plan] = out.root.children;
    expect(core.edits).toEqual([
      { field: "licenses", old: '[{"license":{"id":"MIT"}}]', new: '[{"expression":"GPL-3.0-only"}]' },
    ]);
    expect(plan.edits.map((e: { field: string }) => e.field)).toEqual(["purl"]);
  });

  it("is no change where only bom-refs, the serial number and the timestamp differ", async () => {
    const rebuilt = sbom((c) => {
      for (const component of c) component["bom-ref"] = `build-42/${component.name}`;
    })
      .replace("55555555", "66666666")
      .replace("2026-11-30", "2026-12-01");
    const r = await diff(sbom(), rebuilt, "cdx.json");
    expect(r.code).toBe(0);
    expect(head(r.stdout)).toContain("0 edited");
    const named = await diff(sbom(), rebuilt, "cdx.json", "--compare-field", "bom-ref");
    expect(named.code).toBe(1);
    expect(head(named.stdout)).toContain("3 edited (compared: bom-ref)");
  });

  it("compares a nested field named by --compare-field by its JSON text", async () => {
    const r = await diff(
      sbom(),
      sbom((c) => {
        c[1].hashes = [{ alg: "SHA-512", content: "b".repeat(128) }];
      }),
      "cdx.json",
      "--compare-field",
      "hashes",
    );
    // main's build kept only scalar fields: "0 edited (compared: hashes)" and exit 0.
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: hashes)");
  });
});

// The fictional Tidewater Freight's services as a graph table (--graph): an id repeats with another
// parent (quay-cache serves two services); `image` describes the node, `access` each of its edges.
const services = (apiImage: string, cacheAccess = "rw") =>
  [
    "id,parent,image,access",
    "dispatch,,reg.example/dispatch:5,",
    "billing-api,dispatch,reg.example/billing:" + apiImage + ",rw",
    "route-svc,dispatch,reg.example/route:2,rw",
    "quay-cache,billing-api,reg.example/cache:7,ro",
    `quay-cache,route-svc,,${cacheAccess}`,
    "",
  ].join("\n");

describe("espalier diff OLD NEW --graph of graph tables compares their other columns", () => {
  it("sees a changed image, and names the columns it compared", async () => {
    const r = await diff(services("1.4"), services("1.5"), "csv", "--graph");
    // main's build said "0 edited (no field compared)" and exited 0 here.
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: image, access)");
    expect(r.stdout).toContain(
      "[edited image reg.example/billing:1.4 -> reg.example/billing:1.5] billing-api",
    );
  });

  it("reads a column whose cells differ between an id's rows as a value per parent, not DUPLICATE_ID", async () => {
    const same = await diff(services("1.4"), services("1.4"), "csv", "--graph");
    expect(same.code).toBe(0);
    expect(same.stderr).toBe("");
    const r = await diff(services("1.4", "rw"), services("1.4", "wo"), "csv", "--graph");
    expect(r.code).toBe(1);
    expect(r.stdout).toContain(
      '[edited access {"billing-api":"ro","route-svc":"rw"} -> {"billing-api":"ro","route-svc":"wo"}] quay-cache',
    );
    // Rows that came to agree hold their one value.
    const agreed = await diff(services("1.4", "rw"), services("1.4", "ro"), "csv", "--graph");
    expect(agreed.stdout).toContain('[edited access {"billing-api":"ro","route-svc":"rw"} -> ro] quay-cache');
    // The same rows in another order are the same values.
    const lines = services("1.4").split("\n");
    const reordered = [lines[0], lines[1], lines[2], lines[3], lines[5], lines[4], ""].join("\n");
    const moved = await diff(services("1.4"), reordered, "csv", "--graph");
    expect(head(moved.stdout)).toContain("0 edited");
  });

  it("compares node records' other columns (--nodes OLD --nodes NEW), an edge list's none", async () => {
    const edges = "dispatch billing-api\ndispatch route-svc\nbilling-api quay-cache\nroute-svc quay-cache\n";
    const records = (team: string) =>
      `id,name,team\ndispatch,Dispatch,core\nbilling-api,Billing,ledger\nroute-svc,Routes,core\nquay-cache,Cache,${team}\n`;
    const files = { "deps.txt": edges, "old.csv": records("core"), "new.csv": records("platform") };
    const args = ["diff", "deps.txt", "deps.txt", "--input-format", "edges", "--fail-on-change"];
    const r = await cli([...args, "--nodes", "old.csv", "--nodes", "new.csv"], { files });
    // main's build said "0 edited (no field compared)" and exited 0 here.
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: team)");
    expect(r.stdout).toContain("[edited team core -> platform] Cache");
    const bare = await cli(args, { files });
    expect(head(bare.stdout)).toContain("0 edited (no field compared)");
  });

  it("reads a version range per dependent as a value per parent, which main's build refused", async () => {
    // A dependency table of the fictional Tidewater Freight's packages: the range each dependent asks for.
    const deps = (range: string) =>
      `id,parent,version\ndispatch,,5.0.0\nmanifest-core,dispatch,^2.0\nquay-log,manifest-core,^0.4\nquay-log,dispatch,${range}\n`;
    // main's build: DUPLICATE_ID ("row 4 repeats the id "quay-log" of row 3 with another version").
    const same = await diff(deps("~0.4.1"), deps("~0.4.1"), "csv", "--graph");
    expect(same.code).toBe(0);
    const r = await diff(deps("~0.4.1"), deps("~0.4.2"), "csv", "--graph");
    expect(r.code).toBe(1);
    expect(r.stdout).toContain(
      '[edited version {"dispatch":"~0.4.1","manifest-core":"^0.4"} -> {"dispatch":"~0.4.2","manifest-core":"^0.4"}] quay-log',
    );
    // Named, the field is one value per node, as a label's is.
    const named = await diff(deps("~0.4.1"), deps("~0.4.2"), "csv", "--graph", "--compare-field", "version");
    expect(named.code).toBe(2);
    expect(named.stderr).toContain("[DUPLICATE_ID]");
  });

  it("compares an edge table's other columns as the cells of each node's edges in", async () => {
    const edges = (since: string) =>
      `parent,child,since\ndispatch,billing-api,2024\ndispatch,route-svc,2025\nbilling-api,quay-cache,2024\nroute-svc,quay-cache,${since}\n`;
    // main's build read no column of an edge table but parent and child: "0 edited (no field compared)".
    const r = await diff(edges("2026"), edges(""), "csv", "--input-format", "edges");
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: since)");
    expect(r.stdout).toContain(
      '[edited since {"billing-api":"2024","route-svc":"2026"} -> {"billing-api":"2024","route-svc":""}] quay-cache',
    );
    expect((await diff(edges("2026"), edges("2026"), "csv", "--input-format", "edges")).code).toBe(0);
  });

  it("still refuses a label's column whose cells differ between an id's rows (DUPLICATE_ID)", async () => {
    const r = await cli(["services.csv", "--graph", "--label", "{name} {access}"], {
      files: { "services.csv": services("1.4") },
    });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("[DUPLICATE_ID]");
  });
});

// The fictional Tidewater Freight's packages as a JSON adjacency map (--graph), records naming children.
const packages = (owner: string) =>
  JSON.stringify({
    "tidewater-dispatch": { children: ["manifest-core", "route-plan"], owner: "dispatch-team" },
    "manifest-core": { children: ["quay-log"], owner, checks: { lint: true } },
    "route-plan": { children: ["quay-log"] },
    "quay-log": { owner: "platform" },
  });

describe("espalier diff OLD NEW --graph of JSON adjacency maps compares the records' other fields", () => {
  it("sees a changed owner, and compares no version that no record has", async () => {
    const r = await diff(packages("dispatch-team"), packages("ledger-team"), "json", "--graph");
    expect(r.code).toBe(1);
    // main's build said "(compared: version)" for these records, none of which has a version.
    expect(head(r.stdout)).toContain("1 edited (compared: owner, checks)");
    expect(r.stdout).toContain("[edited owner dispatch-team -> ledger-team] manifest-core");
  });

  it("keeps at most 40 fields, says which it did not compare, and names three in the header", async () => {
    // A record per package with a field per check of a fictional build farm: 45 fields.
    const checks = (last: string) =>
      JSON.stringify({
        "tidewater-dispatch": { children: ["quay-log"] },
        "quay-log": Object.fromEntries(
          Array.from({ length: 45 }, (_, k) => [`check-${k}`, k === 44 ? last : "pass"]),
        ),
      });
    const r = await diff(checks("pass"), checks("fail"), "json", "--graph");
    // check-44 is past the 40th field: not compared, and standard error says so.
    expect(r.code).toBe(0);
    expect(head(r.stdout)).toContain("0 edited (compared: check-0, check-1, check-2 and 37 other fields)");
    expect(r.stderr).toContain('"check-40", "check-41", "check-42", "check-43", "check-44"');
    expect(r.stderr).toContain("[FIELDS_NOT_COMPARED]");
    const named = await diff(
      checks("pass"),
      checks("fail"),
      "json",
      "--graph",
      "--compare-field",
      "check-44",
    );
    expect(named.code).toBe(1);
  });

  it("refuses --compare-field naming a field no record has (FIELD_MISSING), not a comparison of nothing", async () => {
    const r = await diff(packages("a"), packages("b"), "json", "--graph", "--compare-field", "team");
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("[FIELD_MISSING]");
    expect(r.stdout).toBe("");
  });
});
