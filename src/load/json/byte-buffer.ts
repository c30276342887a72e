/** A growable run of bytes, for a token or a value that spans chunks. */
export class ByteBuffer {
  bytes = new Uint8Array(256);
  length = 0;

  /** Appends `src[start, end)`. */
  append(src: Uint8Array, start: number, end: number): void {
    const count = end - start;
    if (this.length + count > this.bytes.length) {
      let capacity = this.bytes.length * 2;
      while (capacity < this.length + count) capacity *= 2;
      const grown = new Uint8Array(capacity);
      grown.set(this.bytes.subarray(0, this.length));
      this.bytes = grown;
    }
    this.bytes.set(src.subarray(start, end), this.length);
    this.length += count;
  }

  clear(): void {
    this.length = 0;
    // A long value must not keep its memory for the rest of the load.
    if (this.bytes.length > 1 << 16) this.bytes = new Uint8Array(256);
  }
}
