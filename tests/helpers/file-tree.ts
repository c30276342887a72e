import { execFileSync } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";

/** Whether `cmd --version` names GNU (coreutils' du, sort and find do): the field tests that run them. */
export function isGnuTool(cmd: string): boolean {
  try {
    return /GNU/.test(execFileSync(cmd, ["--version"], { encoding: "utf8" }));
  } catch {
    return false;
  }
}

/**
 * Writes files below `root`, folders made as needed: a number is a file of that many bytes ('a'), a
 * string the file's text.
 */
export function writeFiles(root: string, files: Record<string, number | string>): void {
  for (const [path, content] of Object.entries(files)) {
    const full = join(root, path);
    mkdirSync(join(full, ".."), { recursive: true });
    writeFileSync(full, typeof content === "number" ? Buffer.alloc(content, 0x61) : content);
  }
}
