import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { runBin } from "../helpers/bin.js";

// A CI runner's locale and time zone are whatever its image sets. Node.js takes its default locale
// from LC_ALL/LANG (ICU), so a toLocaleString or localeCompare without a fixed locale would print
// "286.087.350" under de_DE or sort "ä" by German rules: every output must stay byte-identical.
const ROOT = new URL("../../", import.meta.url).pathname;
const ORG = `${ROOT}fixtures/quillfeather-org.csv`;
const MARCH = `${ROOT}fixtures/examples/org-march.csv`;
const APRIL = `${ROOT}fixtures/examples/org-april.csv`;

const ENVS: Record<string, string>[] = [
  { LANG: "C" },
  { LANG: "de_DE.UTF-8", LC_ALL: "de_DE.UTF-8", TZ: "Pacific/Chatham" },
  { LANG: "hi_IN.UTF-8", LC_ALL: "hi_IN.UTF-8", TZ: "America/St_Johns" },
  { LANG: "C.UTF-8", TZ: "Asia/Kathmandu", CI: "true", TERM: "dumb" },
];

const RUNS: string[][] = [
  [ORG, "--parent-field", "manager", "--size-field", "cost", "--focus", "Q2417", "--share", "total"],
  [
    ORG,
    "--parent-field",
    "manager",
    "--size-field",
    "cost",
    "--sibling-order",
    "name",
    "--format",
    "markdown",
  ],
  [ORG, "--parent-field", "manager", "--size-field", "cost", "--format", "json", "--budget", "15"],
  ["diff", MARCH, APRIL, "--parent-field", "manager", "--format", "markdown"],
];

describe("espalier under any LANG, LC_ALL and TZ", () => {
  it("the environments differ where it matters: Node.js formats 1234567.5 by them", () => {
    const shown = ENVS.slice(0, 3).map(
      (env) =>
        spawnSync(process.execPath, ["-e", "process.stdout.write((1234567.5).toLocaleString())"], {
          env: { PATH: process.env.PATH ?? "", ...env },
          encoding: "utf8",
        }).stdout,
    );
    // Else this machine's Node.js has no locale data and the test below proves nothing.
    expect(new Set(shown).size).toBe(3);
  });

  it.each(RUNS.map((args) => [args.join(" ").replaceAll(ROOT, ""), args]))(
    "%s prints byte-identical output",
    async (_, args) => {
      const outputs = await Promise.all(ENVS.map((env) => runBin(args as string[], { env })));
      for (const r of outputs) expect(r.code, r.stderr).toBe(0);
      for (const r of outputs.slice(1)) expect(r.stdout).toBe(outputs[0].stdout);
    },
  );
});
