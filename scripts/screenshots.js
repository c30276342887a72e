// Renders the demo pictures (summaries and diffs of the fictional fixtures) to SVG and then to PNG,
// so that a person can look at them: `npm run screenshots` (after `npm run build`). Output goes to
// screenshots/ (git-ignored). The PNGs are rasterised by resvg (@resvg/resvg-js, a general-purpose
// SVG renderer) with the machine's fonts; a browser may place text a pixel differently.
import { spawnSync } from "node:child_process";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { Resvg } from "@resvg/resvg-js";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const out = join(root, "screenshots");
mkdirSync(out, { recursive: true });

// A second version of the tidewater file listing, derived deterministically from the fixture: every
// 37th file removed, every 23rd grown by half, and a few files added under one folder.
const lines = readFileSync(join(root, "fixtures/tidewater-files.paths"), "utf8").trimEnd().split("\n");
const changed = [];
lines.forEach((line, k) => {
  const [size, path] = line.split("\t");
  if (k > 0 && k % 37 === 0 && !lines[k + 1]?.split("\t")[1].startsWith(`${path}/`)) return;
  changed.push(k > 0 && k % 23 === 0 ? `${Math.round(Number(size) * 1.5)}\t${path}` : line);
});
for (let k = 0; k < 6; k++) changed.push(`${2048 * (k + 1)}\t./services/ledger/src/tide-gauge-${k}.ts`);
const branch = join(out, "tidewater-files-branch.paths");
writeFileSync(branch, `${changed.join("\n")}\n`);

const org = ["fixtures/quillfeather-org.csv", "--parent-field", "manager", "--size-field", "cost"];
const pictures = [
  ["org-summary", [...org, "--focus", "Q2417", "--label", "{name}", "--budget", "30"]],
  [
    "org-summary-narrow",
    [...org, "--focus", "Q2417", "--label", "{name}", "--budget", "30", "--width", "60"],
  ],
  ["files-summary", ["fixtures/tidewater-files.paths", "--focus", "services/ledger/src", "--budget", "40"]],
  ["files-diff", ["diff", "fixtures/tidewater-files.paths", branch, "--budget", "40"]],
  [
    "org-diff",
    [
      "diff",
      "fixtures/examples/org-march.csv",
      "fixtures/examples/org-april.csv",
      "--parent-field",
      "manager",
    ],
  ],
  [
    "packages-diff",
    ["diff", "fixtures/examples/packages-main.paths", "fixtures/examples/packages-branch.paths"],
  ],
];

for (const [name, args] of pictures) {
  const run = spawnSync(process.execPath, [join(root, "bin/espalier.js"), ...args, "--format", "svg"], {
    cwd: root,
    encoding: "utf8",
  });
  // A diff that finds changes exits 0 unless --fail-on-change is given; anything else is an error.
  if (run.status !== 0) throw new Error(`${name}: espalier exited ${run.status}: ${run.stderr}`);
  writeFileSync(join(out, `${name}.svg`), run.stdout);
  const png = new Resvg(run.stdout, {
    background: "#ffffff",
    font: {
      loadSystemFonts: true,
      defaultFontFamily: "DejaVu Sans Mono",
      monospaceFamily: "DejaVu Sans Mono",
    },
  })
    .render()
    .asPng();
  writeFileSync(join(out, `${name}.png`), png);
  console.log(`wrote screenshots/${name}.svg and .png (${args.join(" ")})`);
}
