import { describe, expect, it } from "vitest";
import { decodeKeys } from "../../src/explore/keys.js";

const bytes = (text: string) => new TextEncoder().encode(text);
const ESC = "\u001b";

describe("decodeKeys(bytes)", () => {
  it("reads the cursor keys in both forms xterm sends them", () => {
    // xterm "Control Sequences", PC-Style Function Keys: cursor keys are CSI A..D in normal mode and
    // SS3 A..D in application mode; CSI is ESC [ (ECMA-48 5.3), SS3 is ESC O (ECMA-48 8.3.143).
    expect(decodeKeys(bytes(`${ESC}[A${ESC}[B${ESC}[C${ESC}[D`))).toEqual([
      { name: "up" },
      { name: "down" },
      { name: "right" },
      { name: "left" },
    ]);
    expect(decodeKeys(bytes(`${ESC}OA${ESC}OB${ESC}OC${ESC}OD`))).toEqual([
      { name: "up" },
      { name: "down" },
      { name: "right" },
      { name: "left" },
    ]);
  });

  it("reads Home, End, the page keys, Delete, F1 and Shift-Tab", () => {
    // xterm "Control Sequences": Home CSI H / CSI 1 ~, End CSI F / CSI 4 ~, PageUp CSI 5 ~, PageDown
    // CSI 6 ~, Delete CSI 3 ~, F1 SS3 P (and CSI 11 ~ in the VT220 style), back-tab CSI Z (CBT, ECMA-48 8.3.7).
    const keys = decodeKeys(
      bytes(`${ESC}[H${ESC}[F${ESC}[1~${ESC}[4~${ESC}[5~${ESC}[6~${ESC}[3~${ESC}OP${ESC}[11~${ESC}[Z`),
    );
    expect(keys).toEqual(
      ["home", "end", "home", "end", "page-up", "page-down", "delete", "f1", "f1", "back-tab"].map(
        (name) => ({
          name,
        }),
      ),
    );
  });

  it("reads a cursor key with a modifier parameter as the key itself", () => {
    // xterm: modified cursor keys are CSI 1 ; m A, where m encodes Shift, Alt, Control.
    expect(decodeKeys(bytes(`${ESC}[1;5A${ESC}[1;2B`))).toEqual([{ name: "up" }, { name: "down" }]);
  });

  it("reads the C0 controls a terminal in raw mode sends for Enter, Tab, Backspace, Ctrl-C and Ctrl-L", () => {
    // ECMA-48 / ISO 646 C0 set: CR 0x0D, LF 0x0A, HT 0x09, BS 0x08, ETX 0x03 (Ctrl-C), FF 0x0C (Ctrl-L);
    // DEL 0x7F is what most terminals send for Backspace (common practice, no source).
    expect(decodeKeys(Uint8Array.of(0x0d, 0x0a, 0x09, 0x08, 0x7f, 0x03, 0x0c))).toEqual(
      ["enter", "enter", "tab", "backspace", "backspace", "ctrl-c", "ctrl-l"].map((name) => ({ name })),
    );
  });

  it("reads a lone ESC at the end of a read as the Escape key", () => {
    expect(decodeKeys(bytes(ESC))).toEqual([{ name: "escape" }]);
    expect(decodeKeys(bytes(`q${ESC}`))).toEqual([{ char: "q" }, { name: "escape" }]);
  });

  it("reads printable characters one code point at a time, multi-byte UTF-8 and astral ones included", () => {
    expect(decodeKeys(bytes("aé/漢😀"))).toEqual(["a", "é", "/", "漢", "😀"].map((c) => ({ char: c })));
  });

  it("drops whole any other control sequence and every other control character", () => {
    // CSI with parameter and intermediate bytes and a final byte (ECMA-48 5.4): a mouse report, a focus
    // event, a bracketed-paste marker; SS3 with another final; Alt-x (ESC x); C1 CSI 0x9B as U+009B.
    const noise = `${ESC}[<0;10;5M${ESC}[I${ESC}[200~${ESC}OQ${ESC}x\u0001\u0007\u009b`;
    expect(decodeKeys(bytes(`${noise}q`))).toEqual([{ char: "q" }]);
  });

  it("never lets a byte of an unknown sequence through as a character", () => {
    for (let final = 0x40; final <= 0x7e; final++) {
      const keys = decodeKeys(bytes(`${ESC}[2;3${String.fromCharCode(final)}`));
      for (const key of keys) expect("char" in key).toBe(false);
    }
  });
});
