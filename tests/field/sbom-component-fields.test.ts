import { existsSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: the CycloneDX 1.5 SBOM that the Python package cryptography 48.0.0 ships (written by
// cargo-cyclonedx 0.5.9), installed on this machine. Its 39 components hold, beside name and version,
// type, bom-ref, author, description, scope, hashes [{alg, content}], licenses [{expression}], purl and
// externalReferences (CycloneDX 1.x specification, component fields). Its bom-refs of the workspace's own
// crates hold the build's temporary folder (`path+file:///__w/…/.tmpXdQ78X/…`).
const SBOM =
  "/root/.pyenv/versions/3.11.7/lib/python3.11/site-packages/cryptography-48.0.0.dist-info/sboms/cryptography-rust.cyclonedx.json";

describe.skipIf(!existsSync(SBOM))("espalier diff of the cryptography wheel's CycloneDX SBOM", () => {
  const text = existsSync(SBOM) ? readFileSync(SBOM, "utf8") : "{}";
  const diff = (newText: string, ...more: string[]) =>
    cli(["diff", "old.cdx.json", "new.cdx.json", "--fail-on-change", ...more], {
      files: { "old.cdx.json": text, "new.cdx.json": newText },
    });

  it("compares every component field but bom-ref, and finds no change against itself", async () => {
    const r = await diff(text, "--format", "json");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    // The fields its components hold, by an independent walk of the parsed document.
    const doc = JSON.parse(text);
    const fields = new Set<string>();
    for (const c of [doc.metadata.component, ...doc.components])
      for (const key of Object.keys(c)) if (!["name", "bom-ref", "components"].includes(key)) fields.add(key);
    expect([...out.compared].sort()).toEqual([...fields].sort());
    expect(out.compared).toContain("hashes");
    expect(out.changes.edited).toBe(0);
  });

  it("sees one component's hash changed at the same version, and a rebuilt folder in the bom-refs is none", async () => {
    const doc = JSON.parse(text);
    const asn1 = doc.components.find((c: { name: string }) => c.name === "asn1");
    asn1.hashes[0].content = "0".repeat(64);
    const r = await diff(JSON.stringify(doc), "--format", "json");
    expect(r.code).toBe(1);
    const out = JSON.parse(r.stdout);
    expect(out.changes).toMatchObject({ added: 0, removed: 0, edited: 1, linked: 0, unlinked: 0 });
    expect(JSON.stringify(out)).toContain('"field":"hashes"');
    // The same document from another build folder: every bom-ref holding it differs, no component.
    const rebuilt = text.replaceAll(".tmpXdQ78X", ".tmpQ1w2E3");
    expect(rebuilt).not.toBe(text);
    const same = await diff(rebuilt);
    expect(same.code).toBe(0);
  });
});
