import { describe, expect, it } from "vitest";
import { formatPlain, formatSize } from "../../src/render/format-size.js";

describe("formatSize(value, units)", () => {
  // Source: IEC 80000-13:2008, binary prefixes: kibi (Ki) = 2^10, mebi (Mi) = 2^20, gibi (Gi) = 2^30,
  // tebi (Ti) = 2^40, pebi (Pi) = 2^50, exbi (Ei) = 2^60; unit symbol B for byte.
  it("uses the IEC 80000-13 binary prefixes at exact powers of 2^10", () => {
    expect(formatSize(2 ** 10, "bytes")).toBe("1.0 KiB");
    expect(formatSize(2 ** 20, "bytes")).toBe("1.0 MiB");
    expect(formatSize(2 ** 30, "bytes")).toBe("1.0 GiB");
    expect(formatSize(2 ** 40, "bytes")).toBe("1.0 TiB");
    expect(formatSize(2 ** 50, "bytes")).toBe("1.0 PiB");
    expect(formatSize(2 ** 60, "bytes")).toBe("1.0 EiB");
  });

  it("prints bytes below 1 KiB as a whole number of B", () => {
    expect(formatSize(0, "bytes")).toBe("0 B");
    expect(formatSize(1023, "bytes")).toBe("1023 B");
  });

  it("rounds to one decimal and moves up a prefix instead of printing 1024.0", () => {
    expect(formatSize(1536, "bytes")).toBe("1.5 KiB");
    expect(formatSize(2 ** 20 - 1, "bytes")).toBe("1.0 MiB");
    expect(formatSize(-3 * 2 ** 20, "bytes")).toBe("-3.0 MiB");
  });

  it("rounds to whole units when asked for no decimals, moving up a prefix at 1024", () => {
    // 18.4 MiB and 18.6 MiB; 1023.6 KiB rounds to 1024 KiB, which is 1 MiB (IEC 80000-13: Mi = 2^20).
    expect(formatSize(18.4 * 2 ** 20, "bytes", 0)).toBe("18 MiB");
    expect(formatSize(18.6 * 2 ** 20, "bytes", 0)).toBe("19 MiB");
    expect(formatSize(1023.6 * 2 ** 10, "bytes", 0)).toBe("1 MiB");
    expect(formatSize(1023.4 * 2 ** 10, "bytes", 0)).toBe("1023 KiB");
    expect(formatSize(700, "bytes", 0)).toBe("700 B");
  });

  it("groups thousands in plain numbers (common practice, no source)", () => {
    expect(formatPlain(1234567)).toBe("1,234,567");
    expect(formatPlain(999)).toBe("999");
    expect(formatPlain(1234.5)).toBe("1,234.5");
    expect(formatPlain(-1000)).toBe("-1,000");
  });
});
