import { readdirSync, readFileSync } from "node:fs";
import { builtinModules } from "node:module";
import { join } from "node:path";
import { build } from "esbuild";
import { describe, expect, it } from "vitest";

const root = new URL("../../", import.meta.url).pathname;
const manifest = JSON.parse(readFileSync(join(root, "package.json"), "utf8")) as {
  dependencies?: Record<string, string>;
  optionalDependencies?: Record<string, string>;
  devDependencies?: Record<string, string>;
};

/** Every .ts file under src/, and the .js files of bin/: the code an installed package runs. */
function sources(): string[] {
  const src = readdirSync(join(root, "src"), { recursive: true, encoding: "utf8" })
    .filter((f) => f.endsWith(".ts") && !f.endsWith(".d.ts"))
    .map((f) => join(root, "src", f));
  const bin = readdirSync(join(root, "bin"))
    .filter((f) => f.endsWith(".js"))
    .map((f) => join(root, "bin", f));
  return [...src, ...bin];
}

/** The package a bare specifier names ("@scope/name/sub" -> "@scope/name", "name/sub" -> "name"). */
function packageOf(specifier: string): string {
  const parts = specifier.split("/");
  return specifier.startsWith("@") ? parts.slice(0, 2).join("/") : parts[0];
}

/**
 * The packages the code imports at run time (static imports, import() and require() of a literal), as
 * esbuild resolves them: type-only imports are erased, as in the compiled code. Each with a file that
 * imports it.
 */
async function runtimeImports(files: readonly string[]): Promise<Map<string, string>> {
  const result = await build({
    entryPoints: [...files],
    bundle: true,
    write: false,
    outdir: "/nonexistent",
    platform: "node",
    format: "esm",
    packages: "external",
    metafile: true,
    logLevel: "silent",
  });
  const found = new Map<string, string>();
  for (const [file, input] of Object.entries(result.metafile.inputs)) {
    for (const imported of input.imports) {
      if (!imported.external) continue;
      const name = imported.path.replace(/^node:/, "");
      if (builtinModules.includes(packageOf(name)) || builtinModules.includes(name)) continue;
      if (!found.has(packageOf(name))) found.set(packageOf(name), file);
    }
  }
  return found;
}

describe("the installed package's code (src/, bin/)", () => {
  it("imports only packages from dependencies or optionalDependencies, never a devDependency", async () => {
    const imports = await runtimeImports(sources());
    // The scan sees the imports it must: a dependency imported from many files (so an empty result, a
    // scan that found nothing, fails here rather than passing the check below).
    expect(imports.has("d3-hierarchy")).toBe(true);
    const installed = new Set([
      ...Object.keys(manifest.dependencies ?? {}),
      ...Object.keys(manifest.optionalDependencies ?? {}),
    ]);
    // npm installs dependencies and optionalDependencies with a package, never its devDependencies
    // (npm's package.json documentation): an import of anything else fails outside this repository.
    const outside = [...imports].filter(([name]) => !installed.has(name)).map(([n, f]) => `${n} (${f})`);
    expect(outside).toEqual([]);
  });

  it("is checked against the same scan that finds a devDependency when one is imported", async () => {
    // The check above can fail: the scan reports a devDependency (here the test's own esbuild import).
    const imports = await runtimeImports([new URL(import.meta.url).pathname]);
    expect(Object.keys(manifest.devDependencies ?? {})).toContain("esbuild");
    expect(imports.has("esbuild")).toBe(true);
  });
});
