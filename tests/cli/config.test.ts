import { describe, expect, it } from "vitest";
import { parse } from "yaml";
import { configSchema } from "../../src/cli/config-schema.js";
import { parseConfig } from "../../src/cli/config-text.js";
import type { EspalierError } from "../../src/errors.js";
import { cli } from "../helpers/cli.js";

const STDIN = "10\ta/x\n20\ta/y\n5\tb/z\n7\tb/w\n";

describe("the project config file (.espalier.yaml, --config)", () => {
  it("is read from .espalier.yaml in the current directory when present", async () => {
    const r = await cli(["-"], { stdin: STDIN, files: { ".espalier.yaml": "budget: 4\nfocus: [a/x]\n" } });
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.trimEnd().split("\n")).toHaveLength(4);
    expect(r.stdout).toContain("* x");
  });

  it("gives way to flags on the command line", async () => {
    const r = await cli(["-", "--budget", "5", "--focus", "b/w"], {
      stdin: STDIN,
      files: { ".espalier.yaml": "budget: 3\nfocus: [a/x]\n" },
    });
    expect(r.stdout.trimEnd().split("\n")).toHaveLength(5);
    expect(r.stdout).toContain("* w");
    expect(r.stdout).not.toContain("* x");
  });

  it("is read from --config FILE, and ignored with --without-config", async () => {
    const files = { "ci/espalier.yaml": "format: json\nbudget: 2\n", ".espalier.yaml": "budget: 3\n" };
    const viaFlag = await cli(["-", "--config", "ci/espalier.yaml"], { stdin: STDIN, files });
    expect(JSON.parse(viaFlag.stdout).budget).toBe(2);
    const none = await cli(["-", "--without-config"], { stdin: STDIN, files });
    expect(none.stdout.trimEnd().split("\n")).toHaveLength(9); // the header, the key line and 7 nodes
  });

  it("rejects an unknown key or a bad value with USAGE naming the file", async () => {
    const bad = await cli(["-"], { stdin: STDIN, files: { ".espalier.yaml": "budgett: 3\n" } });
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain(".espalier.yaml");
    expect(bad.stderr).toContain("[USAGE]");
    const value = await cli(["-"], { stdin: STDIN, files: { ".espalier.yaml": "budget: -4\n" } });
    expect(value.code).toBe(2);
    const yaml = await cli(["-"], { stdin: STDIN, files: { ".espalier.yaml": "budget: [3\n" } });
    expect(yaml.code).toBe(2);
    expect(yaml.stderr).toMatch(/\.espalier\.yaml:\d+:\d+/);
  });

  it("names the nearest option for a misspelt config key, and none for a key near nothing", () => {
    const error = (text: string) => {
      try {
        parseConfig(text, ".espalier.yaml");
      } catch (err) {
        return err as EspalierError;
      }
      throw new Error("no error");
    };
    expect(error("budgett: 3\n")).toMatchObject({
      code: "USAGE",
      details: { key: "budgett", suggestion: "budget" },
    });
    expect(error("widht: 80\n").details).toEqual({ key: "widht", suggestion: "width" });
    expect(error("zzzzzzzz: 1\n").details).toEqual({ key: "zzzzzzzz" });
  });

  it("refuses a config whose aliases expand too far with LIMIT_EXCEEDED naming the file, never INTERNAL", async () => {
    const bomb = `a: &a [1, 2]\nfocus: [${Array.from({ length: 60 }, () => "*a").join(", ")}]\n`;
    const r = await cli(["-"], { stdin: STDIN, files: { ".espalier.yaml": bomb } });
    expect({ code: r.code, stdout: r.stdout }).toEqual({ code: 2, stdout: "" });
    // The one error line: espalier: FILE: message [CODE] (docs/cli.md, Exit status).
    expect(r.stderr).toMatch(/^espalier: \.espalier\.yaml: .+ \[LIMIT_EXCEEDED\]\n$/);
  });

  it("--options-in-effect prints the effective configuration as a valid config file, without an input", async () => {
    const r = await cli(["--options-in-effect", "--budget", "9"], {
      files: { ".espalier.yaml": "parentField: manager\nlabel: '{title}'\n" },
    });
    expect(r.code, r.stderr).toBe(0);
    const printed = parse(r.stdout);
    expect(printed).toEqual({ budget: 9, parentField: "manager", label: "{title}" });
    expect(configSchema().safeParse(printed).success).toBe(true);
    // the defaults not given follow as comments, so every option in effect is shown
    expect(r.stdout).toMatch(/^# format: text$/m);
    expect(r.stdout).toMatch(/^# sizeField: size$/m);
  });

  it("--options-in-effect prints a config file that gives the same run, on inputs that refuse some options named", async () => {
    // Field defect: kept as .espalier.yaml, the printed configuration named every default as a key, so a
    // path list failed with FIELD_MISSING (sizeField: size) and a nested JSON with USAGE (idField).
    const inputs = ["fixtures/tidewater-files.paths", "fixtures/tidewater-deps.json"];
    for (const input of inputs) {
      const asked = [
        input,
        "--budget",
        "12",
        "--sibling-order",
        "size",
        "--format",
        "json",
        "--without-config",
      ];
      const direct = await cli(asked);
      expect(direct.code, direct.stderr).toBe(0);
      const printed = await cli(
        ["--options-in-effect", "--budget", "12", "--sibling-order", "size", "--format", "json"],
        {
          files: { ".espalier.yaml": "" },
        },
      );
      expect(printed.code, printed.stderr).toBe(0);
      const again = await cli([input], { files: { ".espalier.yaml": printed.stdout } });
      expect(again.code, again.stderr).toBe(0);
      expect(again.stdout).toBe(direct.stdout);
    }
  });

  it("also configures espalier diff", async () => {
    const files = { ".espalier.yaml": "failOnChange: true\n" };
    const same = await cli(["diff", "-", "fixtures/quillfeather-costs.yaml"], {
      stdin: "name: x\n",
      files,
    });
    expect(same.code).toBe(1);
  });
});

describe("docs/config.schema.json", () => {
  it("is exactly the JSON Schema generated from the zod config schema, and accepts a typical CI config", async () => {
    const { readFileSync } = await import("node:fs");
    const { configJsonSchema } = await import("../../src/cli/config-schema.js");
    const Ajv2020 = (await import("ajv/dist/2020.js")).default;
    const published = JSON.parse(
      readFileSync(new URL("../../docs/config.schema.json", import.meta.url), "utf8"),
    );
    expect(published).toEqual(JSON.parse(JSON.stringify(configJsonSchema())));
    // Validated with Ajv, a general-purpose JSON Schema (draft 2020-12) validator from the registry.
    const validate = new Ajv2020.default().compile(published);
    const typical = parse(
      "focus: [Q2417, 'services/**/test']\nbudget: 30\nparentField: manager\nsizeField: cost\nlabel: '{title} ({team})'\nformat: markdown\n",
    );
    expect(validate(typical), JSON.stringify(validate.errors)).toBe(true);
    expect(validate({ budgett: 3 })).toBe(false);
  });
});

describe("an input field named on purpose, even by its default name (issue 10.8)", () => {
  // Nested JSON nodes (RFC 8259 §4) whose sizes sit in "bytes" and names in "title": the default
  // fields "size" and "name" are absent.
  const DOC = '{"title":"tidewater","bytes":5,"children":[{"title":"kelp","bytes":2}]}';

  it("--size-field size or --name-field name on the command line is FIELD_MISSING naming the fields", async () => {
    for (const flag of ["--size-field=size", "--name-field=name"]) {
      const r = await cli(["doc.json", flag], { files: { "doc.json": DOC } });
      expect(r.code, flag).toBe(2);
      expect(r.stderr, flag).toContain("[FIELD_MISSING]");
      expect(r.stderr, flag).toContain('"title", "bytes", "children"');
    }
  });

  it("set in the config file counts as named too", async () => {
    const r = await cli(["doc.json"], { files: { "doc.json": DOC, ".espalier.yaml": "sizeField: size\n" } });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("(--size-field)");
  });

  it("left at the default, an absent size or name field is no error", async () => {
    const r = await cli(["doc.json", "--budget", "5"], { files: { "doc.json": DOC } });
    expect(r.code, r.stderr).toBe(0);
  });
});
