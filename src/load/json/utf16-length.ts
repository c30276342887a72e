/**
 * How many UTF-16 units the WHATWG UTF-8 decoder makes of `bytes[s, e)`, invalid sequences included
 * (each maximal invalid subpart is one U+FFFD), so columns count as they do in the decoded text.
 */
export function utf16Length(bytes: Uint8Array, s: number, e: number): number {
  let units = 0;
  let needed = 0;
  let seen = 0;
  let lower = 0x80;
  let upper = 0xbf;
  for (let k = s; k < e; k++) {
    const b = bytes[k];
    if (needed === 0) {
      if (b >= 0xc2 && b <= 0xdf) needed = 1;
      else if (b >= 0xe0 && b <= 0xef) {
        if (b === 0xe0) lower = 0xa0;
        if (b === 0xed) upper = 0x9f;
        needed = 2;
      } else if (b >= 0xf0 && b <= 0xf4) {
        if (b === 0xf0) lower = 0x90;
        if (b === 0xf4) upper = 0x8f;
        needed = 3;
      } else units++; // ASCII, or a byte no sequence starts with
      continue;
    }
    if (b < lower || b > upper) {
      // The sequence so far is one U+FFFD; this byte starts afresh.
      units++;
      needed = 0;
      seen = 0;
      lower = 0x80;
      upper = 0xbf;
      k--;
      continue;
    }
    lower = 0x80;
    upper = 0xbf;
    if (++seen === needed) {
      units += needed === 3 ? 2 : 1;
      needed = 0;
      seen = 0;
    }
  }
  return needed === 0 ? units : units + 1;
}
