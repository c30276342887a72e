import type { SourcePos } from "../../errors.js";
import { utf16Length } from "./utf16-length.js";

/**
 * Lines and columns of byte offsets in a JSON input read in chunks. Columns count UTF-16 units of the
 * decoded text, as the other loaders and an editor count them, so the current line remembers how many
 * of its bytes so far lie beyond their UTF-16 length (the extra bytes of multi-byte characters). It also
 * remembers where the blank run the input may end in began: "the input ends early" is reported after
 * the last non-blank character.
 */
export class JsonPositions {
  line = 1;
  /** Absolute offset where the current line starts. */
  lineStart = 0;
  /** Bytes of the current line so far beyond their UTF-16 length. */
  lineAdjust = 0;
  /** Whether the bytes read last were blank. */
  inBlank = false;
  private blankStart = 0;
  private blankLine = 1;
  private blankLineStart = 0;
  private blankAdjust = 0;

  /** A line feed: the next line starts at absolute offset `start`. */
  newline(start: number): void {
    this.line++;
    this.lineStart = start;
    this.lineAdjust = 0;
  }

  /** A blank run starts at absolute offset `abs`. */
  blankFrom(abs: number): void {
    this.inBlank = true;
    this.blankStart = abs;
    this.blankLine = this.line;
    this.blankLineStart = this.lineStart;
    this.blankAdjust = this.lineAdjust;
  }

  /** Counts the string token `bytes[q, e]` (quotes included), which holds bytes >= 0x80. */
  afterHighString(bytes: Uint8Array, q: number, e: number): void {
    this.lineAdjust += e + 1 - q - utf16Length(bytes, q, e + 1);
  }

  /** Column (UTF-16 units, 1-based) of absolute offset `abs` on the current line. */
  columnAt(abs: number): number {
    return abs - this.lineStart - this.lineAdjust + 1;
  }

  at(abs: number): SourcePos {
    return { line: this.line, column: this.columnAt(abs) };
  }

  /** Of byte `k` of the string token that starts at `bytes[q]`, absolute offset `absQ`. */
  inString(bytes: Uint8Array, q: number, k: number, absQ: number): SourcePos {
    return { line: this.line, column: this.columnAt(absQ) + utf16Length(bytes, q, k) };
  }

  /** Where the blank run the input ended in began. */
  blankStartPos(): SourcePos {
    return { line: this.blankLine, column: this.blankStart - this.blankLineStart - this.blankAdjust + 1 };
  }
}
