// What never prints raw in a human-readable format, each shown as a visible escape `\u{..}`:
// - C0 and C1 controls and DEL (ECMA-48: ESC starts terminal sequences, U+009B is a one-character CSI);
// - the line and paragraph separators U+2028, U+2029;
// - lone surrogates (with the u flag a range of surrogates matches only unpaired ones; UTF-8 output
//   cannot carry them, so they would print as U+FFFD and two different names would look the same);
// - every format character (General_Category Cf: the bidirectional controls of UAX #9, whose "Trojan
//   Source" attack is CVE-2021-42574, soft hyphen, zero-width space, word joiner, byte-order mark,
//   interlinear annotation, tag characters, ...) and every other Default_Ignorable_Code_Point (Unicode
//   DerivedCoreProperties.txt: variation selectors, Hangul fillers, combining grapheme joiner, ...),
//   which print as nothing, so `adm\u{200b}in` would look like `admin`; except where they change how
//   the text looks (see keepInvisible).
// (the class UNSAFE of compileClasses() below)

// Lines that CI runners read as commands (common practice, no source; from memory: Azure Pipelines
// acts on "##vso[" anywhere in a line and GitHub Actions' older syntax on "##["): the bracket becomes
// an escape wherever such a marker appears in a name, whatever the case. "::" commands count only at
// the start of a line, which every layout begins with indentation and a mark instead.
const CI_MARKER = /##(?:vso)?\[/giu;

const PLAIN = /^[\x20-\x22\x24-\x7e]*$/;

/** How an escape begins (`\u{`); in a name's own text, its backslash is escaped. */
const ESCAPE_START = "\\u{";
const LITERAL_ESCAPE = /\\(?=u\{)/g;

/** Longest label shown, in code points; longer ones keep both ends around a marker. */
export const MAX_LABEL = 240;

/**
 * Makes input text safe to print: every control, separator, format or invisible character becomes a
 * visible `\u{..}` escape, so a name can never start a new line, emit a terminal control sequence, hide
 * characters or pass for another name; CI command markers are broken up; very long names are cut in
 * the middle.
 */
export function safeText(text: string, max = MAX_LABEL): string {
  // Most names are printable ASCII without "#": nothing to escape (one test, no allocation).
  if (text.length <= max && PLAIN.test(text) && !text.includes(ESCAPE_START)) return text;
  // Only the two ends of a very long text can show: escape those, not the whole of it, so that the
  // deep paths of a long chain cost their ends each (the cut points lie far outside what is kept).
  if (text.length > 4 * max) {
    const keep = Math.floor((max - 5) / 2);
    const head = Array.from(escapeUnsafe(text.slice(0, 2 * max))).slice(0, keep);
    const tail = Array.from(escapeUnsafe(text.slice(-2 * max))).slice(-keep);
    return `${head.join("")}[...]${tail.join("")}`;
  }
  let out = escapeUnsafe(text);
  if (out.length > max) {
    const points = Array.from(out);
    if (points.length > max) {
      const keep = Math.floor((max - 5) / 2);
      out = `${points.slice(0, keep).join("")}[...]${points.slice(points.length - keep).join("")}`;
    }
  }
  return out;
}

/**
 * Every unsafe or invisible character escaped (but where it shapes the text), CI markers broken, and a
 * backslash that begins `\u{` in the text itself escaped too (`\u{5c}u{9}`), so that a printed `\u{..}`
 * is always an escape and a printed name reads back as one name only (focus/resolve.ts).
 */
function escapeUnsafe(text: string): string {
  return text
    .replace(LITERAL_ESCAPE, "\\u{5c}")
    .replace(unicodeClasses().UNSAFE, escapeUnlessKept)
    .replace(CI_MARKER, (m) => `${m.slice(0, -1)}\\u{5b}`);
}

/** A label as printed: made safe, and `""` for an empty name so the line still shows something. */
export function shownLabel(label: string): string {
  return label === "" ? '""' : safeText(label);
}

/** The visible escape of one code point. */
function escaped(ch: string): string {
  return `\\u{${ch.codePointAt(0)!.toString(16)}}`;
}

function escapeUnlessKept(match: string, offset: number, whole: string): string {
  // A flag tag sequence (UTS #51, section 2.8: U+1F3F4, tag letters or digits, cancel tag) stays whole.
  if (match.length > 2) return match;
  return keepInvisible(match, codePointBefore(whole, offset), codePointAt(whole, offset + match.length))
    ? match
    : escaped(match);
}

// The Unicode property classes are compiled on first use, not when this module loads: most names are
// plain ASCII and never reach them, and compiling them is a good part of a small run's start (issue 14).
function compileClasses() {
  return {
    UNSAFE:
      /\u{1F3F4}[\u{E0030}-\u{E0039}\u{E0061}-\u{E007A}]{1,6}\u{E007F}|[\u0000-\u001f\u007f-\u009f\u2028\u2029\ud800-\udfff\p{Cf}\p{Default_Ignorable_Code_Point}]/gu,
    // Scripts whose spelling uses the zero-width joiner and non-joiner (Unicode 15, section 23.2, "Cursive
    // Connection and Ligatures", and the Indic chapters): between their letters these change the shapes.
    JOINING_SCRIPT:
      /[\p{Script_Extensions=Arabic}\p{Script_Extensions=Syriac}\p{Script_Extensions=Nko}\p{Script_Extensions=Mongolian}\p{Script_Extensions=Devanagari}\p{Script_Extensions=Bengali}\p{Script_Extensions=Gurmukhi}\p{Script_Extensions=Gujarati}\p{Script_Extensions=Oriya}\p{Script_Extensions=Tamil}\p{Script_Extensions=Telugu}\p{Script_Extensions=Kannada}\p{Script_Extensions=Malayalam}\p{Script_Extensions=Sinhala}\p{Script_Extensions=Tibetan}\p{Script_Extensions=Myanmar}\p{Script_Extensions=Khmer}]/u,
    LETTER_OR_MARK: /[\p{L}\p{M}]/u,
    LETTER: /\p{L}/u,
    PICTOGRAPH: /\p{Extended_Pictographic}/u,
    EMOJI_BEFORE_JOINER: /^(?:[\p{Extended_Pictographic}\p{Emoji_Modifier}]|\u{FE0F})$/u,
    EMOJI: /\p{Emoji}/u,
    VISIBLE_BASE: /[\p{L}\p{N}\p{S}\p{P}]/u,
    IDEOGRAPH: /\p{Ideographic}/u,
    MONGOLIAN: /\p{Script_Extensions=Mongolian}/u,
  };
}

let classes: ReturnType<typeof compileClasses> | undefined;

function unicodeClasses(): ReturnType<typeof compileClasses> {
  classes ??= compileClasses();
  return classes;
}

/**
 * Whether an invisible character is part of how the text looks, so it stays: a zero-width joiner in an
 * emoji sequence (UTS #51), a joiner or non-joiner between letters of a script that spells with them,
 * an emoji or text presentation selector after an emoji (or in a keycap), a variation selector after a
 * visible non-ASCII character (StandardizedVariants.txt) or an ideograph (the Ideographic Variation
 * Database), a Mongolian free variation selector after a Mongolian letter. Anywhere else it would only
 * hide itself, and is escaped.
 */
function keepInvisible(ch: string, before: string, after: string): boolean {
  const c = ch.codePointAt(0)!;
  const {
    JOINING_SCRIPT,
    LETTER_OR_MARK,
    LETTER,
    PICTOGRAPH,
    EMOJI_BEFORE_JOINER,
    EMOJI,
    VISIBLE_BASE,
    IDEOGRAPH,
    MONGOLIAN,
  } = unicodeClasses();
  if (c === 0x200d && EMOJI_BEFORE_JOINER.test(before) && PICTOGRAPH.test(after)) return true;
  if (c === 0x200c || c === 0x200d)
    return (
      LETTER_OR_MARK.test(before) &&
      LETTER_OR_MARK.test(after) &&
      JOINING_SCRIPT.test(before) &&
      JOINING_SCRIPT.test(after)
    );
  if (c === 0xfe0e || c === 0xfe0f) {
    if (/^[0-9#*]$/.test(before)) return after === "\u20e3";
    return before !== "" && before.codePointAt(0)! > 0x7f && EMOJI.test(before);
  }
  if (c >= 0xfe00 && c <= 0xfe0d)
    return before !== "" && before.codePointAt(0)! > 0x7f && VISIBLE_BASE.test(before);
  if (c >= 0xe0100 && c <= 0xe01ef) return IDEOGRAPH.test(before);
  if ((c >= 0x180b && c <= 0x180d) || c === 0x180f) return MONGOLIAN.test(before) && LETTER.test(before);
  return false;
}

function codePointBefore(s: string, at: number): string {
  if (at <= 0) return "";
  const low = s.charCodeAt(at - 1);
  if (at >= 2 && low >= 0xdc00 && low <= 0xdfff) {
    const high = s.charCodeAt(at - 2);
    if (high >= 0xd800 && high <= 0xdbff) return s.slice(at - 2, at);
  }
  return s.slice(at - 1, at);
}

function codePointAt(s: string, at: number): string {
  if (at >= s.length) return "";
  return String.fromCodePoint(s.codePointAt(at)!);
}
