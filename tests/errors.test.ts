import { describe, expect, it } from "vitest";
import { hideInputIn } from "../src/cli/hide-input.js";
import { EspalierError, quoted, say } from "../src/errors.js";
import { pseudonym, pseudonymousInput } from "../src/model/pseudonym.js";

describe("EspalierError(code, parts, pos)", () => {
  const err = new EspalierError(
    "DUPLICATE_ID",
    say`row ${2} repeats the id ${quoted.id("Q2417")} of ${quoted.name("Esme Orby")} at ${quoted.path("a/Esme Orby")}; got ${quoted.value("12 KB")} (${quoted.excerpt("bad quote")})`,
    { row: 2 },
  );

  it("shows input text quoted as JSON strings (excerpts as they are) in its message", () => {
    expect(err.message).toBe(
      'row 2 repeats the id "Q2417" of "Esme Orby" at "a/Esme Orby"; got "12 KB" (bad quote)',
    );
  });

  it("hidingInput(pseudonymousInput(key)) prints names and ids as pseudonyms, paths per segment, the rest hidden", () => {
    const hidden = err.hidingInput(pseudonymousInput("k"));
    expect(hidden.code).toBe("DUPLICATE_ID");
    expect(hidden.pos).toEqual({ row: 2 });
    expect(hidden.message).toBe(
      `row 2 repeats the id "${pseudonym("k", "Q2417")}" of "${pseudonym("k", "Esme Orby")}" at ` +
        `"${pseudonym("k", "a")}/${pseudonym("k", "Esme Orby")}"; got (hidden) ((hidden))`,
    );
    // Hidden for good: the copy keeps no input text to print another way.
    expect(JSON.stringify(hidden.parts)).not.toMatch(/Esme|Q2417|12 KB|bad quote/);
    expect(hidden.inFile("org.csv").message).toBe(hidden.message);
  });

  it("crosses a thread as data and comes back the same (toData, fromData)", () => {
    const back = EspalierError.fromData(structuredClone(err.toData()));
    expect(back.message).toBe(err.message);
    expect(back.hidingInput(pseudonymousInput("k")).message).toBe(
      err.hidingInput(pseudonymousInput("k")).message,
    );
  });

  it("keeps a plain string message as wording", () => {
    const plain = new EspalierError("IO", "cannot read x", { file: "x" });
    expect(plain.message).toBe("cannot read x");
    expect(plain.hidingInput(() => "(hidden)").message).toBe("cannot read x");
  });
});

describe("hideInputIn(err, key)", () => {
  it("drops the message of an error that is not an EspalierError (it might quote input)", () => {
    const out = hideInputIn(new TypeError("Cannot read properties of undefined (reading 'Esme Orby')"), "k");
    expect(String(out)).not.toContain("Esme");
    expect(out).toBeInstanceOf(Error);
    expect(out).not.toBeInstanceOf(EspalierError);
    expect(hideInputIn(new RangeError("Invalid string length"), "k")).toBeInstanceOf(RangeError);
  });
});
