/** A binary min-heap of node indices under a comparator (smallest = first in the order). */
export class NodeHeap {
  private items: Int32Array;
  private length = 0;

  constructor(
    private readonly before: (a: number, b: number) => number,
    capacity = 64,
  ) {
    this.items = new Int32Array(capacity);
  }

  get size(): number {
    return this.length;
  }

  /** The first node in the order, without removing it. */
  peek(): number {
    return this.items[0];
  }

  push(node: number): void {
    if (this.length === this.items.length) {
      const grown = new Int32Array(this.items.length * 2);
      grown.set(this.items);
      this.items = grown;
    }
    const items = this.items;
    let i = this.length++;
    while (i > 0) {
      const up = (i - 1) >> 1;
      if (this.before(items[up], node) <= 0) break;
      items[i] = items[up];
      i = up;
    }
    items[i] = node;
  }

  pop(): number {
    const items = this.items;
    const top = items[0];
    const last = items[--this.length];
    let i = 0;
    const n = this.length;
    for (;;) {
      let child = 2 * i + 1;
      if (child >= n) break;
      if (child + 1 < n && this.before(items[child + 1], items[child]) < 0) child++;
      if (this.before(last, items[child]) <= 0) break;
      items[i] = items[child];
      i = child;
    }
    if (n > 0) items[i] = last;
    return top;
  }
}
