/** A key the view reacts to: a named key, or a printable character. */
export type Key =
  | {
      name:
        | "up"
        | "down"
        | "left"
        | "right"
        | "home"
        | "end"
        | "page-up"
        | "page-down"
        | "enter"
        | "escape"
        | "backspace"
        | "delete"
        | "tab"
        | "back-tab"
        | "f1"
        | "ctrl-c"
        | "ctrl-l";
    }
  | { char: string };

export type KeyName = Extract<Key, { name: string }>["name"];

// Control functions (ECMA-48 5th ed., 8.3) and the function-key reports xterm sends for them (xterm
// "Control Sequences", PC-Style Function Keys): CSI A-D / SS3 A-D are the cursor keys, CSI H / SS3 H and
// CSI F / SS3 F Home and End, CSI 1 ~ … CSI 6 ~ the editing keypad, SS3 P / CSI 11 ~ F1, CSI Z back-tab.
const FINAL: Record<string, KeyName> = { A: "up", B: "down", C: "right", D: "left", H: "home", F: "end" };
const TILDE: Record<string, KeyName> = {
  "1": "home",
  "3": "delete",
  "4": "end",
  "5": "page-up",
  "6": "page-down",
  "7": "home",
  "8": "end",
  "11": "f1",
};

/**
 * Splits bytes read from a terminal in raw mode into keys. A lone ESC at the end of a read is the
 * Escape key (a sequence arrives in one read); sequences this view has no use for are dropped whole,
 * and so are other C0 controls, so no byte of a key can ever reach the screen.
 */
export function decodeKeys(bytes: Uint8Array): Key[] {
  const text = new TextDecoder("utf-8", { fatal: false }).decode(bytes);
  const keys: Key[] = [];
  let i = 0;
  while (i < text.length) {
    const c = text.charCodeAt(i);
    if (c === 0x1b) {
      const [key, next] = escapeSequence(text, i);
      if (key) keys.push(key);
      i = next;
      continue;
    }
    i++;
    if (c === 0x0d || c === 0x0a) keys.push({ name: "enter" });
    else if (c === 0x7f || c === 0x08) keys.push({ name: "backspace" });
    else if (c === 0x09) keys.push({ name: "tab" });
    else if (c === 0x03) keys.push({ name: "ctrl-c" });
    else if (c === 0x0c) keys.push({ name: "ctrl-l" });
    else if (c < 0x20 || (c >= 0x80 && c < 0xa0)) continue;
    else {
      // One code point (a surrogate pair stays whole).
      const cp = text.codePointAt(i - 1)!;
      if (cp > 0xffff) i++;
      keys.push({ char: String.fromCodePoint(cp) });
    }
  }
  return keys;
}

/** The key an escape sequence starting at `i` stands for (or none), and where the next key starts. */
function escapeSequence(text: string, i: number): [Key | null, number] {
  const introducer = text[i + 1];
  if (introducer === undefined) return [{ name: "escape" }, i + 1];
  if (introducer === "O") {
    // SS3 (ECMA-48 8.3.143, as ESC O) followed by one final character.
    const final = text[i + 2];
    if (final === undefined) return [null, i + 2];
    if (final === "P") return [{ name: "f1" }, i + 3];
    const name = FINAL[final];
    return [name ? { name } : null, i + 3];
  }
  if (introducer === "[") {
    // CSI (ECMA-48 5.4): parameter bytes 0x30-0x3F, intermediate bytes 0x20-0x2F, one final 0x40-0x7E.
    let j = i + 2;
    while (j < text.length && text.charCodeAt(j) >= 0x30 && text.charCodeAt(j) <= 0x3f) j++;
    const params = text.slice(i + 2, j);
    while (j < text.length && text.charCodeAt(j) >= 0x20 && text.charCodeAt(j) <= 0x2f) j++;
    const final = text[j];
    if (final === undefined || final.charCodeAt(0) < 0x40 || final.charCodeAt(0) > 0x7e) return [null, j];
    const next = j + 1;
    if (final === "~") {
      const name = TILDE[params.split(";")[0]];
      return [name ? { name } : null, next];
    }
    if (final === "Z") return [{ name: "back-tab" }, next];
    const name = FINAL[final];
    // A modifier (CSI 1 ; 5 A) still moves; other parameters are not cursor keys.
    return [name && (params === "" || params.startsWith("1;")) ? { name } : null, next];
  }
  // ESC followed by a character: Alt and that key, which the view does not use; drop both.
  return [null, i + 1 + (text.codePointAt(i + 1)! > 0xffff ? 2 : 1)];
}

/** The key written as in the help ("Up", "Enter", "x"), for messages. */
export function keyLabel(key: Key): string {
  return "char" in key ? key.char : key.name;
}
