/**
 * Whether `bytes[from, to)` are well-formed UTF-8: the byte sequences of the Unicode Standard's table
 * 3-7 (Unicode 15.0, section 3.9), no more; a loop over bytes, as names are short and mostly ASCII.
 */
export function wellFormedUtf8(bytes: Uint8Array, from: number, to: number): boolean {
  for (let k = from; k < to; ) {
    const b = bytes[k];
    if (b < 0x80) {
      k++;
      continue;
    }
    // The sequence's length and the range of its second byte (the others are 80..BF).
    let length: number;
    let low = 0x80;
    let high = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) length = 2;
    else if (b >= 0xe0 && b <= 0xef) {
      length = 3;
      if (b === 0xe0) low = 0xa0;
      else if (b === 0xed) high = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      length = 4;
      if (b === 0xf0) low = 0x90;
      else if (b === 0xf4) high = 0x8f;
    } else return false;
    if (k + length > to || bytes[k + 1] < low || bytes[k + 1] > high) return false;
    for (let x = k + 2; x < k + length; x++) if (bytes[x] < 0x80 || bytes[x] > 0xbf) return false;
    k += length;
  }
  return true;
}
