/**
 * Node index -> slot number, in two typed arrays with open addressing (linear probing). A focus path
 * can hold every node of a deep tree: a Map of a million entries cost the collector seconds in a
 * re-focus, while these arrays are two objects however many entries they hold.
 */
export class NodeTable {
  private keys: Int32Array;
  private values: Int32Array;
  private mask: number;
  private count = 0;

  constructor(expected = 8) {
    let capacity = 16;
    while (capacity < expected * 2) capacity *= 2;
    this.keys = new Int32Array(capacity).fill(-1);
    this.values = new Int32Array(capacity);
    this.mask = capacity - 1;
  }

  /** The slot of `node` (>= 0), or -1 when it has none. */
  get(node: number): number {
    const { keys, mask } = this;
    for (let i = Math.imul(node, 0x9e3779b1) & mask; ; i = (i + 1) & mask) {
      const k = keys[i];
      if (k === node) return this.values[i];
      if (k === -1) return -1;
    }
  }

  /** Gives `node` (>= 0) the slot `value`, replacing any it had. */
  set(node: number, value: number): void {
    if ((this.count + 1) * 2 > this.keys.length) this.grow();
    const { keys, mask } = this;
    for (let i = Math.imul(node, 0x9e3779b1) & mask; ; i = (i + 1) & mask) {
      const k = keys[i];
      if (k === node || k === -1) {
        if (k === -1) this.count++;
        keys[i] = node;
        this.values[i] = value;
        return;
      }
    }
  }

  private grow(): void {
    const { keys, values } = this;
    const capacity = keys.length * 2;
    this.keys = new Int32Array(capacity).fill(-1);
    this.values = new Int32Array(capacity);
    this.mask = capacity - 1;
    this.count = 0;
    for (let i = 0; i < keys.length; i++) if (keys[i] !== -1) this.set(keys[i], values[i]);
  }
}
