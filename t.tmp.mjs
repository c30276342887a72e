const t0 = performance.now();
const cli = await import(process.argv[2]);
const t1 = performance.now();
const { readFile } = await import("node:fs/promises");
await cli.run([process.argv[3]], { stdout: { write() {}, isTTY: false }, stderr: process.stderr, readStdin: async () => Buffer.alloc(0), readFile: (p) => readFile(p), openInput: (n) => cli.openFile(n), loadInWorker: cli.loadInWorker, now: () => performance.now(), env: {} });
const t2 = performance.now();
const u = process.cpuUsage();
console.log(`boot ${t0.toFixed(1)} import ${(t1 - t0).toFixed(1)} run ${(t2 - t1).toFixed(1)} cpu ${((u.user + u.system) / 1000).toFixed(0)}`);
