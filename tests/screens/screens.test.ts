import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { checkText } from "./read-screen.mjs";

// An invented monorepo's file listing (`size<TAB>path`, as find -printf '%s\t%P\n' prints it): long
// names, a deep only-child chain down to a focus, and wide folders, so that narrow screens cut names,
// counts and folds, chain names and print levels in digits, all of which the key must explain.
function listing(edited: boolean): string {
  const rows: string[] = [];
  const deep =
    "services/harbour-ledger-reconciliation/examples/plugin/bazel/java/com/tidewater/ledger/sample";
  rows.push(`4096\t${deep}/BUILD`, `812\t${deep}/README`);
  for (let k = 0; k < 40; k++)
    rows.push(`${1000 + k * 37}\tservices/harbour-ledger-reconciliation/notes-${k}.md`);
  for (const team of ["mooring-log-archive", "quayside-dashboards", "brackwater-tidal-models"])
    for (let k = 0; k < 60; k++) {
      if (edited && k % 17 === 3) continue;
      const size = 2048 + k * 311 + (edited && k % 7 === 1 ? 100 : 0);
      rows.push(`${size}\tpackages/${team}/src/module-${k}/index-of-the-${team}-${k}.ts`);
    }
  if (edited) rows.push("512\tpackages/quayside-dashboards/src/new-gauge.ts");
  return `${rows.join("\n")}\n`;
}

const focus =
  "services/harbour-ledger-reconciliation/examples/plugin/bazel/java/com/tidewater/ledger/sample/BUILD";

describe("every screen explains itself (tests/screens/read-screen.mjs)", () => {
  // The reader's rule of docs/selection.md (common practice, no source): every mark and cut on a
  // screen is said above its lines, or the header says the key was left out and which budget has it;
  // a budget that has room for neither is refused, naming the smallest that works.
  it("summary and diff at 30-80 columns and budgets 6-20: a whole key, one in part saying where the rest is, or the header saying where it is", async () => {
    const files = { "old.tsv": listing(false), "new.tsv": listing(true) };
    const cases: { args: string[]; kind: "summary" | "diff" }[] = [
      { args: ["old.tsv"], kind: "summary" },
      { args: ["old.tsv", "--focus", focus], kind: "summary" },
      { args: ["old.tsv", "--focus", focus, "--no-chains"], kind: "summary" },
      { args: ["diff", "old.tsv", "new.tsv", "--focus", focus], kind: "diff" },
    ];
    const failures: string[] = [];
    // Screens whose key is printed in part: it says every mark and where the rest is (`rest: --legend`).
    const partials: string[] = [];
    for (const c of cases)
      for (const width of [30, 32, 40, 60, 80])
        for (const budget of [6, 8, 10, 12, 14, 20]) {
          const run = (b: number) =>
            cli([...c.args, "--budget", String(b), "--width", String(width)], {
              files,
              env: { NO_COLOR: "1" },
            });
          const r = await run(budget);
          const what = `${c.args.join(" ")} @${width} --budget ${budget}`;
          if (r.code !== 0) {
            const smallest = Number(/smallest budget that works is (\d+)/.exec(r.stderr)?.[1]);
            if (!(smallest > budget)) failures.push(`${what}: ${r.stderr}`);
            else if ((await run(smallest)).code !== 0) failures.push(`${what}: ${smallest} named, refused`);
            continue;
          }
          let room: number | undefined;
          const problems = checkText(r.stdout, {
            budget,
            width,
            kind: c.kind,
            noted: (b) => (room = b),
            partial: () => partials.push(what),
          });
          if (room !== undefined && !/^key: /m.test((await run(room)).stdout))
            problems.push(`--budget ${room} named for the key, and prints none`);
          if (problems.length > 0) failures.push(`${what}: ${problems.join("; ")}\n${r.stdout}`);
        }
    expect(failures).toEqual([]);
    // The deep focus at 30-40 columns leaves the whole key no room at some budget: printed in part there.
    expect(partials.length).toBeGreaterThan(0);
  });
});
