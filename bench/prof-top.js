// The functions with the most self time in a V8 .cpuprofile (as written by node --cpu-prof).
// Usage on its own: node bench/prof-top.js FILE.cpuprofile [N]

import { readFileSync } from "node:fs";
import { relative } from "node:path";
import { fileURLToPath } from "node:url";

const repoRoot = fileURLToPath(new URL("..", import.meta.url));

/** Top `n` functions by self time: { name, where, selfMs, percent }, "(garbage collector)" included. */
export function topFunctions(file, n = 15) {
  const profile = JSON.parse(readFileSync(file, "utf8"));
  const byId = new Map(profile.nodes.map((node) => [node.id, node]));
  const self = new Map();
  let total = 0;
  for (let i = 0; i < profile.samples.length; i++) {
    const node = byId.get(profile.samples[i]);
    const dt = (profile.timeDeltas[i] ?? 0) / 1000;
    total += dt;
    const { functionName, url, lineNumber } = node.callFrame;
    // "(idle)" is waiting; "dispatch" (no script) is the inspector session answering the profiler itself.
    if (functionName === "(idle)" || (functionName === "dispatch" && !url)) continue;
    const where = url ? `${shortUrl(url)}:${lineNumber + 1}` : "";
    const key = `${functionName || "(anonymous)"}\t${where}`;
    self.set(key, (self.get(key) ?? 0) + dt);
  }
  return [...self.entries()]
    .sort((a, b) => b[1] - a[1])
    .slice(0, n)
    .map(([key, ms]) => {
      const [name, where] = key.split("\t");
      return { name, where, selfMs: ms, percent: (100 * ms) / total };
    });
}

function shortUrl(url) {
  const path = url.startsWith("file://") ? fileURLToPath(url) : url;
  return path.startsWith(repoRoot) ? relative(repoRoot, path) : path;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const [file, n] = process.argv.slice(2);
  for (const t of topFunctions(file, Number(n ?? 25)))
    console.log(
      `${t.selfMs.toFixed(0).padStart(7)} ms ${t.percent.toFixed(1).padStart(5)}%  ${t.name}  ${t.where}`,
    );
}
