enum State {
  Value,
  ValueOrEnd,
  KeyOrEnd,
  Key,
  After,
}

/**
 * Offset of the first character that makes `text` invalid JSON (RFC 8259), `text.length` when the input
 * ends too early, or -1 when it is valid. Only run after JSON.parse failed without saying where.
 * An explicit stack of open containers: nesting depth costs no call stack.
 */
export function jsonErrorOffset(text: string): number {
  const n = text.length;
  const open: boolean[] = []; // true = object, false = array
  let state = State.Value;
  let i = 0;
  for (;;) {
    while (i < n && isSpace(text.charCodeAt(i))) i++;
    if (i >= n) return state === State.After && open.length === 0 ? -1 : n;
    const c = text.charCodeAt(i);
    if (state === State.After) {
      if (open.length === 0) return i;
      const inObject = open[open.length - 1];
      if (c === 0x2c /* , */) {
        state = inObject ? State.Key : State.Value;
        i++;
      } else if (c === (inObject ? 0x7d /* } */ : 0x5d) /* ] */) {
        open.pop();
        i++;
      } else {
        return i;
      }
      continue;
    }
    if (state === State.KeyOrEnd || state === State.Key) {
      if (state === State.KeyOrEnd && c === 0x7d /* } */) {
        open.pop();
        state = State.After;
        i++;
        continue;
      }
      if (c !== 0x22 /* " */) return i;
      i = scanString(text, i);
      if (i < 0) return -i - 1;
      while (i < n && isSpace(text.charCodeAt(i))) i++;
      if (i >= n) return n;
      if (text.charCodeAt(i) !== 0x3a /* : */) return i;
      i++;
      state = State.Value;
      continue;
    }
    // A value is expected (or, right after "[", the end of the array).
    if (state === State.ValueOrEnd && c === 0x5d /* ] */) {
      open.pop();
      state = State.After;
      i++;
    } else if (c === 0x7b /* { */) {
      open.push(true);
      state = State.KeyOrEnd;
      i++;
    } else if (c === 0x5b /* [ */) {
      open.push(false);
      state = State.ValueOrEnd;
      i++;
    } else {
      if (c === 0x22) i = scanString(text, i);
      else if (c === 0x2d || (c >= 0x30 && c <= 0x39)) i = scanNumber(text, i);
      else if (c === 0x74) i = scanWord(text, i, "true");
      else if (c === 0x66) i = scanWord(text, i, "false");
      else if (c === 0x6e) i = scanWord(text, i, "null");
      else return i;
      if (i < 0) return -i - 1;
      state = State.After;
    }
  }
}

function isSpace(c: number): boolean {
  return c === 0x20 || c === 0x09 || c === 0x0a || c === 0x0d;
}

/** Offset after the string starting at `i`, or -(offset of the fault) - 1. */
function scanString(text: string, i: number): number {
  const n = text.length;
  for (let k = i + 1; k < n; k++) {
    const c = text.charCodeAt(k);
    if (c === 0x22) return k + 1;
    if (c < 0x20) return -k - 1;
    if (c === 0x5c /* \ */) {
      k++;
      if (k >= n) break;
      const e = text[k];
      if (e === "u") {
        for (let h = 1; h <= 4; h++) {
          if (k + h >= n) return -n - 1;
          if (!/[0-9a-fA-F]/.test(text[k + h])) return -(k + h) - 1;
        }
        k += 4;
      } else if (!'"\\/bfnrt'.includes(e)) {
        return -k - 1;
      }
    }
  }
  return -n - 1;
}

/** Offset after the number starting at `i`, or -(offset of the fault) - 1. */
function scanNumber(text: string, i: number): number {
  const n = text.length;
  let k = i;
  if (text.charCodeAt(k) === 0x2d) k++;
  const digits = (from: number) => {
    let d = from;
    while (d < n && text.charCodeAt(d) >= 0x30 && text.charCodeAt(d) <= 0x39) d++;
    return d;
  };
  if (k >= n) return -n - 1;
  if (text.charCodeAt(k) === 0x30) k++;
  else if (digits(k) === k) return -k - 1;
  else k = digits(k);
  if (k < n && text.charCodeAt(k) === 0x2e /* . */) {
    const end = digits(k + 1);
    if (end === k + 1) return -Math.min(end, n) - 1;
    k = end;
  }
  if (k < n && (text.charCodeAt(k) === 0x65 || text.charCodeAt(k) === 0x45) /* e E */) {
    k++;
    if (k < n && (text.charCodeAt(k) === 0x2b || text.charCodeAt(k) === 0x2d)) k++;
    const end = digits(k);
    if (end === k) return -Math.min(end, n) - 1;
    k = end;
  }
  return k;
}

/** Offset after `word` at `i`, or -(offset of the first differing character) - 1. */
function scanWord(text: string, i: number, word: string): number {
  for (let k = 0; k < word.length; k++) {
    if (i + k >= text.length || text[i + k] !== word[k]) return -Math.min(i + k, text.length) - 1;
  }
  return i + word.length;
}
