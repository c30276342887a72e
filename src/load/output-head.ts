/**
 * The top-level members espalier's JSON outputs write (docs/summary.schema.json and
 * docs/diff.schema.json, whose top levels allow no others; a test keeps these equal to them).
 */
export const OUTPUT_MEMBERS: ReadonlySet<string> = new Set([
  "format",
  "match",
  "compared",
  "sizes",
  "budget",
  "lines",
  "changes",
  "totals",
  "foci",
  "unmatchedFoci",
  "input",
  "notes",
  "root",
]);

/** The format ids espalier writes: `espalier-summary/1`, `espalier-diff/1`. */
const FORMAT_ID = /^espalier-[a-z]+\/[0-9A-Za-z.-]{1,20}$/;

/** Longest member name looked at: longer ones are none of {@link OUTPUT_MEMBERS}. */
const LONGEST_NAME = 32;

/**
 * The members `jq -S` and other key sorters put before `format` (docs' schemas): past {@link
 * ANY_ORDER_UNITS}, only while every member so far is one of these is the text read on, so that a
 * saved output whose foci fill more than that is known, and a document of the user's own whose first
 * member merely has an output's name (`root`, `notes`) is not held and scanned to its end.
 */
const SORTED_BEFORE_FORMAT: ReadonlySet<string> = new Set(["budget", "changes", "compared", "foci"]);

/** The start (UTF-16 units: within the 64 KiB a stream's detection reads) where members come in any order. */
export const ANY_ORDER_UNITS = 16384;

/** Longest format value looked at (`espalier-` + a kind + `/` + a version, perhaps with escapes). */
const LONGEST_FORMAT = 120;

/** What ends a run of a skipped string's text, and of a skipped object's or array's outside strings. */
const STRING_STOP = /["\\]/g;
const NEST_STOP = /["{}[\]]/g;

type Phase = "open" | "name" | "nameEnd" | "colon" | "value" | "format" | "skip" | "after";

/**
 * Tells whether a JSON text is one of espalier's own outputs by its top-level `format` member, whatever
 * the members' order and the whitespace (`jq -S .` sorts them, putting `budget` and `foci` first;
 * `jq -c` and `python3 -m json.tool` re-space them): the text is read in pieces, each member before
 * `format` skipped, and it is no output as soon as a member espalier does not write comes before it.
 * So a user's document stops being looked at on its first other member, and one that is espalier's
 * is known once its `format` is read: in any order within the first {@link ANY_ORDER_UNITS}, and past
 * them after members that sort before it (a long list of foci, sorted first). {@link read} returns the format id, `null` when the text is not
 * espalier output, or `undefined` while more text is needed to tell.
 */
export class OutputHead {
  private phase: Phase = "open";
  /** The member name, or the format value, being read (raw JSON string text, escapes kept). */
  private text = "";
  private escaped = false;
  /** Inside a skipped value: nesting depth, and whether in a string. */
  private depth = 0;
  private inString = false;
  private verdict: string | null | undefined = undefined;
  /** Whether nothing has been read yet (a byte order mark may come first). */
  private first = true;
  /** Text read so far (UTF-16 units), and whether every member so far sorts before `format`. */
  private seen = 0;
  private sorted = true;

  /** Reads the next piece of the text; the verdict so far (see the class). */
  read(piece: string): string | null | undefined {
    let i = 0;
    while (i < piece.length && this.verdict === undefined) {
      // A skipped value is passed over by native search, so a long one costs little.
      if (this.phase === "skip") i = this.skip(piece, i);
      else {
        this.step(piece.charCodeAt(i), piece[i]);
        this.first = false;
        i++;
      }
      if (this.verdict === undefined && !this.sorted && this.seen + i > ANY_ORDER_UNITS) this.not();
    }
    this.seen += piece.length;
    return this.verdict;
  }

  /** The verdict at the text's end: `undefined` (more needed) becomes `null`. */
  end(): string | null {
    return this.verdict ?? null;
  }

  private step(c: number, ch: string): void {
    const space = c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09;
    const phase = this.phase;
    if (phase === "nameEnd") this.nameChar(c, ch);
    else if (phase === "format") {
      if (!(space && this.depth === -1)) this.formatChar(c, ch);
    } else if (space || (phase === "open" && c === 0xfeff && this.first)) {
      // Whitespace between tokens (a byte order mark before the text): nothing to tell.
    } else if (phase === "open") {
      if (c === 0x7b) this.to("name");
      else this.not();
    } else if (phase === "name") {
      // A member's name; "}" (no format member) or anything else: no output of espalier's.
      if (c === 0x22) {
        this.text = "";
        this.to("nameEnd");
      } else this.not();
    } else if (phase === "colon") {
      if (c === 0x3a) this.memberNamed(decoded(this.text));
      else this.not();
    } else if (phase === "value") {
      this.depth = c === 0x7b || c === 0x5b ? 1 : 0;
      this.inString = c === 0x22;
      this.to("skip");
    } else if (phase === "after") {
      if (c === 0x2c) this.to("name");
      else this.not();
    }
  }

  private nameChar(c: number, ch: string): void {
    if (this.escaped) this.escaped = false;
    else if (c === 0x5c) this.escaped = true;
    else if (c === 0x22) {
      this.to("colon");
      return;
    }
    this.text += ch;
    if (this.text.length > LONGEST_NAME) this.not();
  }

  private memberNamed(name: string | null): void {
    if (name === "format") {
      this.text = "";
      this.escaped = false;
      this.depth = -1;
      this.to("format");
    } else if (name !== null && OUTPUT_MEMBERS.has(name)) {
      if (!SORTED_BEFORE_FORMAT.has(name)) this.sorted = false;
      this.to("value");
    } else this.not();
  }

  private formatChar(c: number, ch: string): void {
    if (this.depth === -1) {
      // Not yet at the value's opening quote: a format that is no string is no output's.
      if (c === 0x22) this.depth = 0;
      else this.not();
      return;
    }
    if (this.escaped) this.escaped = false;
    else if (c === 0x5c) this.escaped = true;
    else if (c === 0x22) {
      // As espalier writes it (a "/" may be escaped, as some writers do): no other escapes.
      const value = this.text.startsWith("espalier-") ? decoded(this.text) : null;
      this.verdict = value !== null && FORMAT_ID.test(value) ? value : null;
      return;
    }
    this.text += ch;
    if (this.text.length > LONGEST_FORMAT) this.not();
  }

  /** Passes over a member's value from `piece[i]`: a string, an object or array, or a scalar; where it stopped. */
  private skip(piece: string, i: number): number {
    if (this.escaped) {
      this.escaped = false;
      return i + 1;
    }
    if (this.inString) {
      STRING_STOP.lastIndex = i;
      const stop = STRING_STOP.exec(piece);
      if (stop === null) return piece.length;
      if (stop[0] === "\\") this.escaped = true;
      else {
        this.inString = false;
        if (this.depth === 0) this.to("after");
      }
      return stop.index + 1;
    }
    if (this.depth === 0) {
      // A scalar: it ends at the comma, brace or space after it.
      const c = piece.charCodeAt(i);
      if (c === 0x2c) this.to("name");
      else if (c === 0x7d) this.not();
      else if (c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09) this.to("after");
      return i + 1;
    }
    NEST_STOP.lastIndex = i;
    const stop = NEST_STOP.exec(piece);
    if (stop === null) return piece.length;
    const c = stop[0];
    if (c === '"') this.inString = true;
    else if (c === "{" || c === "[") this.depth++;
    else if (--this.depth === 0) this.to("after");
    return stop.index + 1;
  }

  private to(phase: Phase): void {
    this.phase = phase;
  }

  private not(): void {
    this.verdict = null;
  }
}

/** A JSON string's text (between its quotes) decoded; null when it is not valid JSON string text. */
function decoded(raw: string): string | null {
  if (!raw.includes("\\")) return raw;
  try {
    return JSON.parse(`"${raw}"`) as string;
  } catch {
    return null;
  }
}
