// A storage-inventory-like path list: what a listing of an object store or a backup volume looks like,
// and the shape the bench's tree (a find-like listing) does not cover: only leaf lines (no directory
// lines: the reader makes every directory from the paths), deep paths (10 to 14 segments) and long
// shared prefixes (a few volumes, projects, dates and runs, many shards and parts), in sorted order.
// Invented names only (the fictional monorepo "tidewater" and company Quillfeather Instruments).
// Seeded; the same parameters give the same bytes, and a manifest lets later runs reuse the file.
//
// Usage on its own: node bench/inventory.js [--nodes N] [--force]

import {
  closeSync,
  existsSync,
  mkdirSync,
  openSync,
  readFileSync,
  statSync,
  writeFileSync,
  writeSync,
} from "node:fs";
import { join } from "node:path";
import { dataDir, makeRng } from "./generate.js";

/** Bump when the output changes for the same parameters. */
export const INVENTORY_VERSION = 2;

const PROJECTS = [
  "tidewater-ledger",
  "tidewater-mooring",
  "quill-telemetry",
  "quill-optics",
  "tidewater-docs",
];
const KINDS = ["raw", "derived", "reports"];

/**
 * Writes `lines` leaf lines `size<TAB>path` to `inventory-N.paths` (N = lines): paths like
 * `archive/vol03/quill-telemetry/raw/2026/11/28/run-00417/shard-007/part-000123.dat`. Returns the
 * manifest: bytes, and two leaves far apart as foci.
 */
export function ensureInventory({ lines, seed = 20261202, force = false, log }) {
  mkdirSync(dataDir, { recursive: true });
  const file = join(dataDir, `inventory-${lines}.paths`);
  const mPath = join(dataDir, `inventory-${lines}.manifest.json`);
  const params = { version: INVENTORY_VERSION, lines, seed };
  if (!force && existsSync(mPath) && existsSync(file)) {
    const manifest = JSON.parse(readFileSync(mPath, "utf8"));
    if (
      JSON.stringify(manifest.params) === JSON.stringify(params) &&
      statSync(file).size === manifest.bytes
    ) {
      log?.(`data: reusing ${lines.toLocaleString("en-US")}-line inventory`);
      return { ...manifest, file };
    }
  }
  log?.(`data: generating a ${lines.toLocaleString("en-US")}-line storage inventory...`);
  const t0 = performance.now();
  const rng = makeRng(seed);
  const fd = openSync(file, "w");
  const chunk = [];
  let chunkBytes = 0;
  let bytes = 0;
  const flush = () => {
    const buf = Buffer.from(chunk.join(""), "utf8");
    writeSync(fd, buf);
    bytes += buf.length;
    chunk.length = 0;
    chunkBytes = 0;
  };
  const foci = [];
  let written = 0;
  let runs = 0;
  // Nested loops in sorted order; the innermost sizes are drawn so the total comes out at `lines`.
  const partsPerShard = 64;
  const shardsPerRun = 16;
  outer: for (let vol = 1; ; vol++) {
    for (const project of PROJECTS) {
      for (const kind of KINDS) {
        for (let day = 0; day < 400; day++) {
          const date = `${2024 + Math.floor(day / 360)}/${String(1 + (Math.floor(day / 30) % 12)).padStart(2, "0")}/${String(1 + (day % 30)).padStart(2, "0")}`;
          const perDay = rng.int(1, 3);
          for (let run = 0; run < perDay; run++) {
            const runDir = `archive/vol${String(vol).padStart(2, "0")}/${project}/${kind}/${date}/run-${String(++runs).padStart(6, "0")}`;
            for (let shard = 0; shard < shardsPerRun; shard++) {
              const dir = `${runDir}/shard-${String(shard).padStart(3, "0")}`;
              const parts = rng.int(1, partsPerShard);
              for (let part = 0; part < parts; part++) {
                const path = `${dir}/part-${String(part).padStart(6, "0")}.${kind === "reports" ? "md" : "dat"}`;
                const size = Math.floor(2 ** (10 + rng.next() * 16));
                const line = `${size}\t${path}\n`;
                chunk.push(line);
                chunkBytes += line.length;
                if (chunkBytes > 1 << 22) flush();
                if (written === Math.floor(lines / 7) || written === Math.floor((lines * 5) / 7))
                  foci.push(path.slice("archive/".length)); // the root is "archive"
                written++;
                if (written === lines) break outer;
              }
            }
          }
        }
      }
    }
  }
  flush();
  closeSync(fd);
  const manifest = {
    params,
    lines,
    bytes,
    foci,
    seconds: Math.round(performance.now() - t0) / 1000,
  };
  writeFileSync(mPath, `${JSON.stringify(manifest, null, 2)}\n`);
  log?.(`data: written in ${manifest.seconds} s (${(bytes / 2 ** 20).toFixed(0)} MiB)`);
  return { ...manifest, file };
}

if (process.argv[1] && import.meta.url === `file://${process.argv[1]}`) {
  const args = process.argv.slice(2);
  const at = args.indexOf("--nodes");
  const lines = at === -1 ? 1_000_000 : Number(args[at + 1]);
  const m = ensureInventory({
    lines,
    force: args.includes("--force"),
    log: (s) => process.stderr.write(`${s}\n`),
  });
  process.stdout.write(`${JSON.stringify({ ...m, file: m.file }, null, 2)}\n`);
}
