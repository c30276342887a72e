// The glob bound (issue 13.3): a crafted segment glob such as `*a*a*a*a*a*a*a*a*b` against long names
// that almost match. A backtracking matcher tries every way of placing the stars, a number of tries
// that grows as a power of the name's length; espalier's matcher (src/focus/wildcard.ts: the literal
// pieces found leftmost-first with Knuth-Morris-Pratt) makes at most 2·|name| + |pieces| comparisons.
// This case times one match per name length, ten times longer each step, and counts the comparisons:
// linear growth means about 10x the time and 10x the comparisons per step (ratio ≈ 1 per character).
// Informs; never gates. Usage: npm run bench -- --globs [--repeat N]

import { existsSync } from "node:fs";
import { join } from "node:path";
import { pathToFileURL } from "node:url";

const LENGTHS = [1_000, 10_000, 100_000, 1_000_000, 10_000_000];

/** Runs the case and prints one table; `dist` is the built package's folder. */
export async function benchGlobs(args, dist) {
  const repeatAt = args.indexOf("--repeat");
  const repeat = repeatAt >= 0 ? Number(args[repeatAt + 1]) : 5;
  const file = join(dist, "focus", "wildcard.js");
  if (!existsSync(file)) throw new Error(`${file} is missing: build first (npm run build)`);
  const { compileWildcard, matchWildcard, wildcardWork } = await import(pathToFileURL(file).href);
  const patterns = [
    // The crafted case as reported: a name of n "a"s. The literal tail "b" is checked first, so the
    // matcher answers at once; a backtracking matcher tries the placements of eight stars first.
    ["*a*a*a*a*a*a*a*a*b", (n) => "a".repeat(n)],
    // The same glob on a name that matches: each "a" found leftmost, at once.
    ["*a*a*a*a*a*a*a*a*b", (n) => `${"a".repeat(n - 1)}b`],
    // The worst case for this matcher: the tail fits, seven "a"s are found at once, and the piece
    // "aab" is searched through the whole name (n - 1 "a"s) without being found before the tail.
    ["*a*a*a*a*a*a*a*aab*b", (n) => `${"a".repeat(n - 1)}b`],
  ];
  // Warm-up, so the first sizes are not timed before the engine has compiled the matcher.
  for (const [pattern, nameOf] of patterns) {
    const glob = compileWildcard(pattern);
    const name = nameOf(100_000);
    for (let k = 0; k < 200; k++) matchWildcard(glob, name);
  }
  const rows = [];
  for (const [pattern, nameOf] of patterns) {
    const glob = compileWildcard(pattern);
    let before;
    for (const n of LENGTHS) {
      const name = nameOf(n);
      const times = [];
      let comparisons = 0;
      let matched = false;
      for (let k = 0; k < repeat; k++) {
        wildcardWork.comparisons = 0;
        const t0 = process.hrtime.bigint();
        matched = matchWildcard(glob, name);
        times.push(Number(process.hrtime.bigint() - t0) / 1e6);
        comparisons = wildcardWork.comparisons;
      }
      times.sort((a, b) => a - b);
      const ms = times[times.length >> 1];
      rows.push({
        pattern,
        length: n,
        matched,
        medianMs: ms,
        comparisons,
        perChar: comparisons / n,
        nsPerChar: (ms * 1e6) / n,
        growth: before === undefined ? undefined : ms / before,
      });
      before = ms;
    }
  }
  const pad = (s, w) => String(s).padStart(w);
  process.stdout.write(
    `glob bound: one match per name, median of ${repeat}; linear = comparisons per character flat, time x10 per step\n`,
  );
  process.stdout.write(
    `${"pattern".padEnd(20)}${pad("name length", 12)}${pad("match", 7)}${pad("median ms", 11)}${pad("comparisons", 13)}${pad("per char", 10)}${pad("ns/char", 9)}${pad("time x", 8)}\n`,
  );
  for (const r of rows) {
    process.stdout.write(
      `${r.pattern.padEnd(20)}${pad(r.length.toLocaleString("en"), 12)}${pad(r.matched, 7)}${pad(r.medianMs.toFixed(3), 11)}${pad(r.comparisons.toLocaleString("en"), 13)}${pad(r.perChar.toFixed(2), 10)}${pad(r.nsPerChar.toFixed(2), 9)}${pad(r.growth === undefined ? "" : r.growth.toFixed(1), 8)}\n`,
    );
  }
  return rows;
}
