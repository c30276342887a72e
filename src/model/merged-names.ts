import { indexOfName, NamePool, type Names, PrefixedNames } from "./names.js";

/**
 * The names of a tree made of two others' nodes (a diff's combined tree): node k has name `newIndex[k]`
 * of `fromNew`, or, where that is -1, name `oldIndex[k]` of `fromOld`. Nothing is copied: a name is read
 * from the tree it came from when asked for. For names few readers ask for (a combined tree's row ids:
 * a label or a focus by id), where copying every one into a pool of their own would touch memory the
 * size of the tree for nothing (docs/performance.md); and a combined tree's names, which a summary reads
 * only for the nodes it shows.
 */
export class MergedNames implements Names {
  constructor(
    private readonly fromNew: Names,
    private readonly newIndex: Int32Array,
    private readonly fromOld: Names,
    private readonly oldIndex: Int32Array,
  ) {}

  get length(): number {
    return this.newIndex.length;
  }

  get(k: number): string {
    const n = this.newIndex[k];
    return n >= 0 ? this.fromNew.get(n) : this.fromOld.get(this.oldIndex[k]);
  }

  /**
   * The first node named `text`: the new tree's nodes keep their order among themselves here, so its
   * first node of that name is the first of them; the other nodes are read one by one.
   */
  indexOf(text: string): number {
    if (text === "") return -1;
    const { newIndex, oldIndex } = this;
    const n = indexOfName(this.fromNew, text);
    const total = newIndex.length;
    for (let k = 0; k < total; k++) {
      const from = newIndex[k];
      if (from === -1 ? this.fromOld.get(oldIndex[k]) === text : from === n) return k;
    }
    return -1;
  }

  /** See {@link pooledBytes}: each name's bytes from its version's pool, or null. */
  pooledBytes(): ((k: number) => Uint8Array) | null {
    const fromNew = pooledBytes(this.fromNew);
    const fromOld = pooledBytes(this.fromOld);
    if (fromNew === null || fromOld === null) return null;
    const { newIndex, oldIndex } = this;
    return (k) => {
      const n = newIndex[k];
      return n >= 0 ? fromNew(n) : fromOld(oldIndex[k]);
    };
  }
}

/**
 * Name i's UTF-8 bytes as a pool keeps them, for a reader that copies every name's bytes (the
 * interactive search): for a pool, a tree put under a new root, and merged names over those; null for
 * names kept as strings, or when some name is kept as a string that UTF-8 cannot carry (see NamePool).
 */
export function pooledBytes(names: Names): ((i: number) => Uint8Array) | null {
  if (names instanceof NamePool) return names.hasExact ? null : (i) => names.bytesOf(i);
  if (names instanceof MergedNames) return names.pooledBytes();
  if (names instanceof PrefixedNames && names.first.isWellFormed()) {
    const rest = pooledBytes(names.rest);
    if (rest === null) return null;
    const first = Buffer.from(names.first, "utf8");
    return (i) => (i === 0 ? first : rest(i - 1));
  }
  return null;
}
