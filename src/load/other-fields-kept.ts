import { type FieldOptions, fieldsRead } from "./other-fields.js";

/**
 * The most other fields a load of node objects keeps (LoadOptions.keepOtherFields): each is a string
 * per node, so a document whose node objects hold a field per key of a dictionary (a map of ids read
 * as fields) would otherwise keep millions of strings. Fields first met past it are not kept, and the
 * reading names them (TreeReading.otherFieldsLeft). As many as the names a nested document's sample of
 * fields held before (missing-field.ts FieldsSeen); a lock file's records hold about 20.
 */
export const MOST_OTHER_FIELDS = 40;

/** How many of the fields left out past {@link MOST_OTHER_FIELDS} a reading names. */
const NAMED_LEFT = 20;

/**
 * Which other fields of node objects a load keeps as it reads them (LoadOptions.keepOtherFields): every
 * field not read for the tree (name, size, children, id, parent, path) nor kept for a purpose, in the
 * order first met, at most {@link MOST_OTHER_FIELDS}; the loader keeps their values, as text by node.
 */
export class OtherFieldsKept {
  private readonly read: Set<string>;
  /** The fields kept, in the order first met. */
  private readonly kept = new Set<string>();
  /** Fields met past the most kept (the first {@link NAMED_LEFT}), and whether there were more. */
  private readonly left: string[] = [];
  private moreLeft = false;

  constructor(options: FieldOptions) {
    this.read = fieldsRead(options);
  }

  /**
   * Whether `field` is an other field kept, taken on when first met. False for a field read for the tree
   * or kept for a purpose, and for one met past the most kept (named in `reading`).
   */
  keeps(field: string): boolean {
    if (this.kept.has(field)) return true;
    if (this.read.has(field)) return false;
    if (this.kept.size >= MOST_OTHER_FIELDS) {
      if (!this.left.includes(field)) {
        if (this.left.length < NAMED_LEFT) this.left.push(field);
        else this.moreLeft = true;
      }
      return false;
    }
    this.kept.add(field);
    return true;
  }

  /**
   * The reading's account of them: `otherFields`, those of the kept fields some node holds (`held`, all
   * when not given), and `otherFieldsLeft` when some were not kept.
   */
  reading(held?: (field: string) => boolean): {
    otherFields?: readonly string[];
    otherFieldsLeft?: { names: string[]; more: boolean };
  } {
    const fields = [...this.kept].filter((field) => held === undefined || held(field));
    return {
      ...(fields.length > 0 ? { otherFields: fields } : {}),
      ...(this.left.length > 0 ? { otherFieldsLeft: { names: [...this.left], more: this.moreLeft } } : {}),
    };
  }
}

/**
 * The values of kept other fields by node, each column made when its field is first met: the nodes
 * before hold nothing (""), as do nodes between that lack it. Nodes come in order.
 */
export class OtherColumns {
  private readonly columns = new Map<string, string[]>();

  /** Node `node`'s value of field `field`. */
  set(field: string, node: number, text: string): void {
    let column = this.columns.get(field);
    if (column === undefined) {
      column = new Array<string>(node).fill("");
      this.columns.set(field, column);
    }
    while (column.length < node) column.push("");
    column[node] = text;
  }

  /** The columns, each of `length` values, in the order first met. */
  fields(length: number): [string, string[]][] {
    const fields: [string, string[]][] = [];
    for (const [field, column] of this.columns) {
      if (column.length > length) column.length = length;
      while (column.length < length) column.push("");
      fields.push([field, column]);
    }
    return fields;
  }
}
