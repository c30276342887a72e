import { readFileSync } from "node:fs";

/** espalier's version, read from package.json (two folders up from this module, in src/ and in dist/). */
export function packageVersion(): string {
  const text = readFileSync(new URL("../../package.json", import.meta.url), "utf8");
  return (JSON.parse(text) as { version: string }).version;
}
