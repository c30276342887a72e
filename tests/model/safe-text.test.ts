import { describe, expect, it } from "vitest";
import { safeText } from "../../src/model/safe-text.js";

describe("safeText(text)", () => {
  it("escapes newlines, carriage returns and the ESC of ANSI sequences (ECMA-48 C0 controls)", () => {
    expect(safeText("a\nb")).toBe("a\\u{a}b");
    expect(safeText("a\rb")).toBe("a\\u{d}b");
    expect(safeText("\u001b[31mred")).toBe("\\u{1b}[31mred");
    expect(safeText("\u009b31m")).toBe("\\u{9b}31m");
  });

  it("escapes Unicode bidirectional controls (CVE-2021-42574, Unicode UAX #9)", () => {
    expect(safeText("admin\u202e\u2066x")).toBe("admin\\u{202e}\\u{2066}x");
    expect(safeText("\u2028")).toBe("\\u{2028}");
  });

  it("escapes lone surrogates, which UTF-8 cannot carry, and keeps paired ones (ECMA-262 isWellFormed)", () => {
    expect(safeText("dock\ud800")).toBe("dock\\u{d800}");
    expect(safeText("\udc00x")).toBe("\\u{dc00}x");
    expect(safeText("ok \u{1f600}")).toBe("ok \u{1f600}");
    expect(safeText("a\ud800b").isWellFormed()).toBe(true);
  });

  it("leaves ordinary text, accents and CJK untouched", () => {
    expect(safeText("Łukasz Ørsted 山田")).toBe("Łukasz Ørsted 山田");
  });

  it("cuts very long names in the middle, keeping both ends", () => {
    const long = `${"a".repeat(5000)}END`;
    const out = safeText(long, 50);
    expect(Array.from(out).length).toBeLessThanOrEqual(50);
    expect(out.startsWith("aaa")).toBe(true);
    expect(out.endsWith("END")).toBe(true);
  });
});
