import type { Buffer } from "node:buffer";
import { EspalierError, type MessagePart, quoted, type SourcePos, say } from "../../errors.js";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import type { ReadingNote } from "../../model/reading-note.js";
import { isSize } from "../../model/size-rule.js";
import { badNodeSize } from "../bad-node-size.js";
import {
  dedupedEntriesNote,
  NPM_CHILDREN_FIELD,
  OVERRIDDEN_FIELD,
  VERSION_FIELD,
} from "../deduped-entries.js";
import { describeNode } from "../describe-node.js";
import { defaultLoadOptions, type LoadOptions } from "../load-options.js";
import { MISSING_FIELD, missingEntriesNote } from "../missing-entries.js";
import {
  atMostOneLevel,
  FieldsSeen,
  loneRoot,
  mapOfNodes,
  missingField,
  nameFieldNamed,
  sizeFieldNamed,
  wrapperChildren,
} from "../missing-field.js";
import { limitExceeded, NodeSink } from "../node-sink.js";
import { countNodeObjects, NodesNotRead, plainValues } from "../nodes-not-read.js";
import { otherFields, withOtherFields } from "../other-fields.js";
import { OtherFieldsKept } from "../other-fields-kept.js";
import { fieldSizeUnit } from "../size-unit.js";
import { linkTable } from "../table/link-table.js";
import { rowsTable } from "../table/rows-table.js";
import { withNotes } from "../with-notes.js";
import { JsonTokenizer, NUL, numberValue, TRUE } from "./json-tokenizer.js";
import { JsonKeeper, K_HIGH, K_LINES, KeptJson } from "./kept-json.js";
import { isArrayIndexKey, reorderKeyedChildren } from "./keyed-order.js";
import { RowsProbe } from "./rows-probe.js";
import { C_KEEP, C_PROBE, C_ROW, Captures } from "./value-capture.js";

/** A JSON number's bytes are ASCII (RFC 8259, section 6). */
const ASCII = new TextDecoder("latin1");

// What an open container is.
const SKIP = 0; // a value nobody reads (still checked to be JSON)
const NODE = 1;
const CHILD_LIST = 2;
const CHILD_MAP = 3;
const TOP_LIST = 4;
const ROWS = 5;
/** A value inside a field of a node object that is not read (nodes-not-read.ts): its node objects counted. */
const LOOSE = 6;

// What the next value is.
const S_SKIP = 0;
const S_TOP = 1;
const S_TOP_ITEM = 2;
const S_CHILD = 3;
const S_KEYED = 4;
const S_FIELD = 5;
const S_ROW = 6;
/** The size field of an object in a value not read (LOOSE). */
const S_LOOSE_SIZE = 7;
const itemSlot = [S_SKIP, S_SKIP, S_CHILD, S_SKIP, S_TOP_ITEM, S_ROW, S_SKIP];

// The kind of the last value seen for a node's field.
const ABSENT = 0;
const NULL = 1;
const NUMBER = 2;
const STRING = 3;
const BOOLEAN = 4;
const COLLECTION = 5;

// What a field of a node object is for (bits).
const F_NAME = 1;
/** The children field by default (load-options.ts). */
const DEFAULT_CHILDREN = defaultLoadOptions.childrenField;
const F_SIZE = 2;
const F_CHILDREN = 4;
/** The field by which a node says it is missing (missing-entries.ts). */
const F_MISSING = 8;
/** The fields by which npm ls tells a deduped entry (deduped-entries.ts), read under its children field. */
const F_VERSION = 16;
const F_OVERRIDDEN = 32;

// What `sized` says of a node: SIZED, or EMPTY; with MISSING or DEDUPED besides.
const SIZED = 1;
const EMPTY = 2;
const MISSING = 4;
const DEDUPED = 8;

// What an object in a value not read (LOOSE) holds (bits): one of the fields makes it a node object.
const L_OBJECT = 1;
const L_SHAPED = 2;

interface Field {
  bytes: Uint8Array;
  text: string;
  mask: number;
  /** Indices into the kept columns (`keepFields`, then the other fields kept). */
  keeps: number[];
  /** A field kept only as one of the node objects' other fields (LoadOptions.keepOtherFields). */
  other: boolean;
  /**
   * Keeping the other fields: whether it is known to be none (read for the tree, or met past the most
   * kept), or kept already.
   */
  settled: boolean;
}

/** What is known about an open container; one per nesting level, reused. */
class Frame {
  node = -1;
  keyed = false;
  // The kind of the last value of each field, and where it is (line, column), for errors at the end.
  nameKind = ABSENT;
  nameLine = 0;
  nameColumn = 0;
  sizeKind = ABSENT;
  size = 0;
  sizeText = "";
  sizeLine = 0;
  sizeColumn = 0;
  childrenKind = ABSENT;
  childrenLine = 0;
  childrenColumn = 0;
  /** Sink length when the current children value began; -1 when there is none. */
  childrenMark = -1;
  /** Keys the node object has so far: none at its end makes it an empty entry (`{}`). */
  fieldCount = 0;
  /** Whether its `missing` field's last value is `true` (missing-entries.ts), and the line of that value. */
  missing = false;
  missingLine = 0;
  /** Whether it holds a text `version`, and the line of it, and an `overridden` (deduped-entries.ts). */
  version = false;
  versionLine = 0;
  overridden = false;
  /**
   * Children by name: the keys seen, the children in input order, whether they need reordering. Made
   * when a level first holds children by name, so a chain a million levels deep costs no Set per level.
   */
  private keySet: Set<string> | null = null;
  private childList: number[] | null = null;
  get keys(): Set<string> {
    this.keySet ??= new Set();
    return this.keySet;
  }
  get children(): number[] {
    this.childList ??= [];
    return this.childList;
  }
  reorder = false;
  /**
   * Read against an earlier version (kept-json.ts): a node's counterpart there (-1: none), whose
   * children its children are compared with; a children array's next child there to compare with.
   */
  old = -1;
  oldNext = -1;
  /** A node read (not taken) whose counterpart is still to be found by its name (see pairByName). */
  pairing = false;
  /** Keeping (kept-json.ts): the line the node object opened on, and the column adjustment then. */
  openLine = 0;
  openAdjust = 0;
  /** A value not read (LOOSE): what it is (L_ bits), and its size field's last value when a size. */
  loose = 0;
  looseSize = 0;
}

/** Nodes whose keys are sampled for messages (FieldsSeen): never taken from an earlier version. */
const SAMPLED_NODES = 1000;
/**
 * Children of a node's counterpart that a child of its is compared with before it is read: the one at
 * the cursor and the next (the cursor's was removed). A child read finds its counterpart by name among
 * more (pairByName), and moves the cursor past it.
 */
const TRIED_CHILDREN = 2;
/** Children of a node's counterpart that a child read is looked for among, by name. */
const PAIRED_CHILDREN = 8;

/**
 * Nested JSON (and JSON rows) read from UTF-8 bytes, whole or in chunks, never as one string: the
 * tokenizer's hooks build the nodes directly into flat arrays as they come.
 * - Node shapes as in {@link walkNested}: children as an array or an object keyed by name (numbers and
 *   null as leaves), a top-level array as several roots, nodes numbered in document order.
 * - JSON.parse's object semantics: a repeated key keeps its first place and its last value; in children
 *   keyed by name, array-index keys come first, ascending (ECMA-262 OrdinaryOwnPropertyKeys).
 * - Rows when {@link RowsProbe} says so (each row is parsed on its own: rows cost what they do in
 *   memory, but no string holds the whole file).
 * Structure errors carry the line and column of the value at fault; with several faults, the first in
 * document order is reported.
 */
export class JsonLoader extends JsonTokenizer {
  private readonly options: LoadOptions;
  private readonly sink: NodeSink;
  private readonly fields: Field[] = [];
  /**
   * SIZED where a node has an own size (hasSizes counts only nodes a repeated key did not replace);
   * EMPTY where its object has no key at all (`{}`).
   */
  private sized = new Uint8Array(1024);
  /**
   * Kept field values by node; undefined where a node has no such field (it becomes ""): `keepFields`'
   * and then, keeping the other fields, theirs as first met (`keptNames` names them all).
   */
  private readonly kept: (string | undefined)[][];
  private readonly keptNames: string[];
  /** Keeping the node objects' other fields (LoadOptions.keepOtherFields), which; else undefined. */
  private readonly others: OtherFieldsKept | undefined;
  /** Keys of node objects that are no other field kept (read for the tree, or past the most kept). */
  private readonly notOther: Uint8Array[] = [];
  private readonly probe: RowsProbe;
  private readonly rows: unknown[] = [];
  // Where each row starts, for the errors about a row the table finds.
  private readonly rowLines: number[] = [];
  private readonly rowColumns: number[] = [];
  private readonly captures: Captures;
  private readonly found: boolean;
  // The top-level node object's last key, and its fields holding an object or array that are not its
  // children (a lone root with these is not what the input holds: see `end`).
  private rootKey = "";
  /** Whether the top level is an array (of nodes or rows). */
  private topList = false;
  private readonly rootContainers: string[] = [];
  /** The first object under the top-level node that holds the children field: its key there, and the line. */
  private childrenBelowTop: { holder: string; line: number } | undefined;

  // What the next value is for, and what each open container is.
  private slot = S_TOP;
  private slotField = 0;
  private slotKey = "";
  private role = new Uint8Array(64);
  private readonly frames: Frame[] = [];
  /** Keys of the first node objects, for the message of a field no node has. */
  private readonly seen = new FieldsSeen();
  /** Whether a node not keyed by name has a name in the name field (text, a number or a boolean). */
  private hasNames = false;
  /**
   * With a children field other than `children`: the depth of the node object whose last key was an
   * unread `children` (-1: none), and where the first such key held an object or array (see `end`).
   */
  private unreadChildrenDepth = -1;
  private unreadChildrenAt: { line: number; column: number } | undefined;
  /** Node objects not keyed by name: with no name anywhere, more than one is a tree of "" names. */
  private unkeyed = 0;
  /**
   * Keys repeated where a repeat drops nodes (in a children-by-name object, or a node's children field
   * twice), the first such, and the nodes the earlier values held: a REPEATED_KEY note says so.
   */
  private repeats = 0;
  private firstRepeat: { key: string; line: number } | undefined;
  private droppedNodes = 0;
  /** Whether a node object holds `overridden`, and the line of the first deduped entry's version (DEDUPED_ENTRIES). */
  private overriddenSeen = false;
  /** Whether `version` and `overridden` are read: under npm's children field only. */
  private npmFields = false;
  private readonly dedupedLines = new Map<number, number>();
  /** The line of each `"missing": true` by node (MISSING_ENTRIES), while no node is moved or dropped. */
  private readonly missingLines = new Map<number, number>();
  /** Whether children by name were put in JSON.parse's order (nodes moved: missingLines may be stale). */
  private reordered = false;
  /**
   * Node objects in fields not read (nodes-not-read.ts); in the field value open now (LOOSE), how many
   * and their sizes, its key and line; the last key of a node object that is not read, where it is.
   */
  private readonly notRead = new NodesNotRead();
  private looseCount = 0;
  private looseSizes = 0;
  /** The key of the field value open now (LOOSE), as written (quotes included), decoded when it holds nodes. */
  private looseKey = new Uint8Array(64);
  private looseKeyLength = 0;
  private looseLine = 0;
  /** The fields that make an object a node object (name, size, children), and which is the size. */
  private readonly shapeFields: Uint8Array[];
  private readonly shapeTexts: string[];
  private readonly shapeSize: number;
  private unreadKey: Uint8Array = new Uint8Array(0);
  private unreadQ = 0;
  private unreadE = 0;

  // Never null, and of one class whatever the load, so that a diff's NEW runs the code its OLD compiled
  // (a field that held null in one load and an object in the next changes the loader's shape).
  /** Keeping the input for a later version's load (kept-json.ts), when `keeping`. */
  private readonly keeper: JsonKeeper;
  private readonly keeping: boolean;
  /** The earlier version's kept input this one is read against (kept-json.ts), when `taking`. */
  private readonly earlier: KeptJson;
  private readonly taking: boolean;
  /** What this load kept for a later version's, once ended (when it kept). */
  keptForLater: KeptJson | undefined;

  /**
   * `found`: espalier chose `options.childrenField` (the configured one was absent). `earlier`: what an
   * earlier version's load of node objects kept (`options.earlierVersion`'s, kept-json.ts): node
   * objects whose bytes it has at the same place in the tree are taken from it, not read.
   */
  constructor(options: LoadOptions, as?: "json" | "rows", found = false, earlier?: KeptJson) {
    super(options.limits);
    this.options = options;
    this.captures = new Captures(this.maxTokenBytes);
    this.found = found;
    this.probe = new RowsProbe(as);
    this.sink = new NodeSink(options.maxNodes, false, options.earlierVersion?.name);
    this.kept = options.keepFields.map(() => []);
    this.keptNames = [...options.keepFields];
    this.others = options.keepOtherFields === true ? new OtherFieldsKept(options) : undefined;
    const add = (text: string, mask: number, keep: number) => {
      let field = this.fields.find((f) => f.text === text);
      if (!field) {
        field = {
          bytes: new TextEncoder().encode(text),
          text,
          mask: 0,
          keeps: [],
          other: false,
          settled: false,
        };
        this.fields.push(field);
      }
      field.mask |= mask;
      if (keep >= 0) field.keeps.push(keep);
      // Only a field that marks entries (missing, npm's version and overridden) may be an other field.
      field.settled = field.keeps.length > 0 || (field.mask & (F_NAME | F_SIZE | F_CHILDREN)) !== 0;
    };
    add(options.nameField, F_NAME, -1);
    add(options.sizeField, F_SIZE, -1);
    add(options.childrenField, F_CHILDREN, -1);
    for (let f = 0; f < options.keepFields.length; f++) add(options.keepFields[f], 0, f);
    this.shapeTexts = [options.nameField, options.sizeField, options.childrenField];
    this.shapeFields = this.shapeTexts.map((text) => new TextEncoder().encode(text));
    this.shapeSize = 1;
    add(MISSING_FIELD, F_MISSING, -1);
    // Only in a listing with npm's children field: no more keys to compare in any other document.
    if (options.childrenField === NPM_CHILDREN_FIELD) {
      this.npmFields = true;
      add(VERSION_FIELD, F_VERSION, -1);
      add(OVERRIDDEN_FIELD, F_OVERRIDDEN, -1);
    }
    // Read again alike: nodes only, by the default children field (no unread `children` to note), the
    // whole document, own sizes (a tree read as totals changes them after the load).
    const alike =
      as !== "rows" &&
      options.childrenField === DEFAULT_CHILDREN &&
      options.startAt === undefined &&
      options.folderSizes !== "total";
    const size = options.inputBytes;
    this.keeper = new JsonKeeper(
      alike && options.keepForLaterVersion === true && size !== undefined ? size : 0,
      options.inputReadAgain === true,
    );
    this.keeping = this.keeper.keeping;
    this.taking =
      alike &&
      earlier !== undefined &&
      options.earlierVersion?.name === earlier.names &&
      this.sink.readsEarlierNames &&
      this.sameReadAs(earlier) &&
      earlier.readable(options.earlierInput);
    this.earlier = this.taking ? earlier! : KeptJson.none;
    // The earlier version's other fields first, in its order: a node taken from it copies their values.
    if (this.taking) for (const text of earlier!.readAs.otherFields ?? []) this.keepOther(text, 0);
    if (this.taking) {
      // About as many nodes as the earlier version: room made once.
      const nodes = Math.ceil(1.05 * earlier!.length) + 1024;
      this.sink.makeRoom(nodes);
      this.sized = new Uint8Array(nodes);
    }
  }

  /** Whether `earlier` was read as this input is. */
  private sameReadAs(earlier: KeptJson): boolean {
    const o = this.options;
    const r = earlier.readAs;
    return (
      r.nameField === o.nameField &&
      r.sizeField === o.sizeField &&
      r.childrenField === o.childrenField &&
      r.keepFields.length === o.keepFields.length &&
      r.keepFields.every((f, k) => f === o.keepFields[k]) &&
      (r.otherFields !== undefined) === (this.others !== undefined) &&
      r.maxTokenBytes === this.maxTokenBytes &&
      r.maxDepth === this.maxDepth
    );
  }

  /** Ends the input; the nodes, ready for `buildTree`. */
  end(): LinkedNodes {
    this.endTokens();
    if (this.probe.rows) {
      const { rowLines, rowColumns } = this;
      const place = (row: number) =>
        row >= 1 && row <= rowLines.length
          ? { line: rowLines[row - 1], column: rowColumns[row - 1] }
          : undefined;
      return withNotes(linkTable(rowsTable(this.rows, place), this.options, "rows"), this.notUtf8Notes());
    }
    const sink = this.sink;
    if (sink.length === 0) throw new EspalierError("INPUT_EMPTY", "the top-level array holds no nodes");
    if (sink.length === 1 && this.rootContainers.length > 0) {
      if (this.childrenBelowTop !== undefined && !this.topList)
        throw mapOfNodes(this.options.childrenField, this.childrenBelowTop, this.options.startAt, "json");
      throw loneRoot(this.options.childrenField, this.rootContainers, "json", this.topList);
    }
    if (this.unreadChildrenAt !== undefined && atMostOneLevel(sink.parentOf, sink.length))
      throw wrapperChildren(this.options.childrenField, this.unreadChildrenAt, "json");
    for (let i = 0; i < sink.length && !sink.hasSizes; i++)
      if ((this.sized[i] & SIZED) !== 0) sink.hasSizes = true;
    if (!sink.hasSizes && sizeFieldNamed(this.options))
      throw missingField("size", this.options.sizeField, this.seen.list(), true);
    if (!this.hasNames && nameFieldNamed(this.options))
      throw missingField("name", this.options.nameField, this.seen.list(), true);
    const { keepFields } = this.options;
    const fields = new Map<string, string[]>();
    for (let f = 0; f < keepFields.length; f++) {
      // Seen only on nodes of the tree: a value a repeated key replaced does not count.
      const column = this.kept[f];
      let seen = false;
      // Columns are written only where a node has the field: a field no node has stays empty.
      if (column.length > 0) column.length = sink.length;
      for (let i = 0; i < column.length; i++) {
        if (column[i] === undefined) column[i] = "";
        else seen = true;
      }
      if (!seen) {
        if (this.options.optionalKeepFields?.includes(keepFields[f])) continue;
        throw missingField("kept", keepFields[f], this.seen.list(), true);
      }
      fields.set(keepFields[f], column as string[]);
    }
    // The other fields kept: those some node of the tree holds.
    for (let f = keepFields.length; f < this.kept.length; f++) {
      const column = this.kept[f];
      if (column.length > sink.length) column.length = sink.length;
      if (!column.some((value) => value !== undefined)) continue;
      for (let i = 0; i < sink.length; i++) if (column[i] === undefined) column[i] = "";
      fields.set(this.keptNames[f], column as string[]);
    }
    let emptyEntries = 0;
    for (let i = 0; i < sink.length; i++) if (this.sized[i] === EMPTY) emptyEntries++;
    if (this.keeping) this.keptForLater = this.keptJson(this.keeper);
    sink.nameNamelessTop(this.options.rootName);
    const notes: ReadingNote[] = this.notUtf8Notes();
    if (this.repeats > 0) notes.push(this.repeatNote());
    const missing = this.missingNote();
    if (missing) notes.push(missing);
    const deduped = this.dedupedNote();
    if (deduped) notes.push(deduped);
    // Nodes moved or dropped: a node index kept with a place may name another node now.
    const stale = this.reordered || this.droppedNodes > 0;
    const notRead = this.notRead.note(this.options, "json", (i) => (stale ? undefined : this.where(i)));
    if (notRead) notes.push(notRead);
    const linked = sink.finish(this.options.rootName, fields, null, {
      shape: "nodes",
      sizeUnit: fieldSizeUnit(this.options.sizeField),
      childrenField: this.options.childrenField,
      ...(this.found ? { childrenFieldFound: true } : {}),
      ...(emptyEntries > 0 ? { emptyEntries } : {}),
      ...(!this.hasNames && this.unkeyed > 1 ? { unnamed: this.options.nameField } : {}),
      ...(notes.length > 0 ? { notes } : {}),
      ...(this.others !== undefined
        ? this.others.reading((field) => fields.has(field))
        : withOtherFields(otherFields(this.seen.list(), this.options))),
    });
    if (emptyEntries === 0) return linked;
    const empty = new Uint8Array(sink.length);
    for (let i = 0; i < sink.length; i++) if (this.sized[i] === EMPTY) empty[i] = 1;
    return { ...linked, empty };
  }

  /** What this load keeps for a later version's: one top-level node object's, else nothing. */
  private keptJson(keeper: JsonKeeper): KeptJson | undefined {
    const sink = this.sink;
    const one = !this.topList && this.role[0] === NODE && sink.parentOf[0] === -1;
    const { nameField, sizeField, childrenField, keepFields } = this.options;
    const readAs = {
      nameField,
      sizeField,
      childrenField,
      keepFields,
      ...(this.others !== undefined ? { otherFields: this.keptNames.slice(keepFields.length) } : {}),
      maxTokenBytes: this.maxTokenBytes,
      maxDepth: this.maxDepth,
    };
    // Nodes moved (children by name put in order) or dropped (a key repeated) are no longer where the
    // keeper saw them added.
    if (!one || this.reordered || this.droppedNodes > 0) keeper.drop();
    return keeper.kept(
      readAs,
      sink.length,
      this.sized,
      sink.parentOf,
      sink.ownSize,
      sink.name,
      this.kept,
      this.pos.line > 1,
      this.hasNames,
    );
  }

  // ---------------------------------------------------------------------------------------------------
  // Tokens.

  /** A key: picks what the value after it is for. */
  protected key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    const top = this.depth - 1;
    const role = this.role[top];
    if (role === NODE) {
      const fields = this.fields;
      let found = -1;
      this.frames[top].fieldCount++;
      const ofRoot = top === 0 || (top === 1 && this.role[0] === TOP_LIST && this.frames[1].node === 0);
      const sampled = this.seen.wants(this.frames[top].node);
      if (ofRoot || sampled) {
        // One call and one store, run for the first thousand nodes' keys: code compiled in one load
        // then has what it needs for the top node's keys of the next one (docs/performance.md).
        const text = this.text(bytes, q, e, absQ);
        if (sampled) this.seen.add(text);
        this.rootKey = ofRoot ? text : this.rootKey;
      }
      if (this.escaped) {
        const text = this.text(bytes, q, e, absQ);
        for (let f = 0; f < fields.length; f++) if (fields[f].text === text) found = f;
      } else {
        const length = e - q - 1;
        for (let f = 0; f < fields.length && found < 0; f++) {
          const want = fields[f].bytes;
          if (want.length !== length) continue;
          let k = 0;
          while (k < length && bytes[q + 1 + k] === want[k]) k++;
          if (k === length) found = f;
        }
      }
      if (this.others !== undefined && (found < 0 || !fields[found].settled))
        found = this.otherKey(found, bytes, q, e, absQ, this.frames[top].node);
      this.slot = found < 0 ? S_SKIP : S_FIELD;
      this.slotField = found;
      if (found < 0) {
        // Its text is made only if its value is an object or array (see `open`).
        this.unreadKey = bytes;
        this.unreadQ = q;
        this.unreadE = e;
      }
      this.unreadChildrenDepth =
        (found < 0 || fields[found].other) &&
        this.unreadChildrenAt === undefined &&
        this.defaultChildrenKey(bytes, q, e)
          ? this.depth
          : -1;
      if (found >= 0 && top === 1 && this.probe.undecided && (fields[found].mask & F_CHILDREN) !== 0) {
        // The first element has children: the input is nodes, and that element need not be kept whole.
        this.captures.open.shift();
        this.probe.nodes();
      }
    } else if (role === CHILD_MAP) {
      this.slotKey = this.text(bytes, q, e, absQ);
      this.slot = S_KEYED;
    } else {
      this.slot = role === LOOSE ? this.looseField(bytes, q, e, absQ, this.frames[top]) : S_SKIP;
      // The children field in an object under the top-level node: the top may be a map of nodes by name.
      if (top === 1 && this.role[0] === NODE && this.childrenBelowTop === undefined)
        if (this.text(bytes, q, e, absQ) === this.options.childrenField)
          this.childrenBelowTop = { holder: this.rootKey, line: this.pos.line };
    }
  }

  /**
   * A key of an object in a value not read: a field a node is read for makes the object a node object
   * (nodes-not-read.ts); the size field's value is read next (S_LOOSE_SIZE).
   */
  private looseField(bytes: Uint8Array, q: number, e: number, absQ: number, frame: Frame): number {
    const shapeFields = this.shapeFields;
    const length = e - q - 1;
    const escaped = this.escaped;
    const text = escaped ? this.text(bytes, q, e, absQ) : "";
    let slot = S_SKIP;
    for (let f = 0; f < shapeFields.length; f++) {
      if (escaped) {
        if (this.shapeTexts[f] !== text) continue;
      } else {
        const want = shapeFields[f];
        if (want.length !== length) continue;
        let k = 0;
        while (k < length && bytes[q + 1 + k] === want[k]) k++;
        if (k < length) continue;
      }
      frame.loose |= L_SHAPED;
      if (f === this.shapeSize) {
        slot = S_LOOSE_SIZE;
        frame.looseSize = 0;
      }
    }
    return slot;
  }

  protected stringValue(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    const slot = this.slot;
    if (slot === S_SKIP) return;
    if (slot === S_FIELD && !this.escaped && this.fields[this.slotField].mask === F_NAME) {
      // Only a name, and spelled without escapes: its bytes go to the name pool as they are (invalid
      // UTF-8 reads back as U+FFFD, as decoding the whole text would give it), with no string made.
      const field = this.fields[this.slotField];
      const frame = this.frames[this.depth - 1];
      if (field.keeps.length === 0 && !frame.keyed) {
        frame.nameKind = STRING;
        this.sink.setNameBytes(frame.node, bytes, q + 1, e);
        return;
      }
    }
    // In any other slot the string is an error; its escapes are checked first all the same.
    const text = this.text(bytes, q, e, absQ);
    this.scalar(STRING, text, 0, this.pos.columnAt(absQ));
  }

  protected number(bytes: Uint8Array, s: number, e: number, absS: number, integerEnd: number): void {
    if (this.slot === S_SKIP) return;
    const value = numberValue(bytes, s, e, integerEnd);
    // A number that is no size is reported as written: 9007199254740993 is not its rounded neighbour.
    const text = isSize(value) ? "" : ASCII.decode(bytes.subarray(s, e));
    this.scalar(NUMBER, text, value, this.pos.columnAt(absS));
  }

  /**
   * Whether the key `bytes[q, e]` (quotes included) is `children` while another field holds children:
   * a wrapper's field named as the children field (`{"filesystems": [...]}` of a mount table) reads
   * the top level only, and every node below keeps its children under `children`, unread.
   */
  private defaultChildrenKey(bytes: Uint8Array, q: number, e: number): boolean {
    if (
      this.options.childrenField === DEFAULT_CHILDREN ||
      this.escaped ||
      e - q - 1 !== DEFAULT_CHILDREN.length
    )
      return false;
    for (let k = 0; k < DEFAULT_CHILDREN.length; k++)
      if (bytes[q + 1 + k] !== DEFAULT_CHILDREN.charCodeAt(k)) return false;
    return true;
  }

  protected word(word: Uint8Array, absS: number): void {
    if (this.slot === S_SKIP) return;
    const column = this.pos.columnAt(absS);
    if (word === NUL) this.scalar(NULL, "", 0, column);
    else this.scalar(BOOLEAN, word === TRUE ? "true" : "false", 0, column);
  }

  protected nextItem(top: number): void {
    this.slot = itemSlot[this.role[top]];
  }

  protected chunkEnd(buf: Buffer): void {
    this.captures.chunkEnd(buf, this.pos.line);
    if (this.keeping) {
      this.keeper.write(buf);
      // After the first chunk: room for the nodes the input likely has (its length over the bytes per
      // node so far, plus 5%).
      const size = this.options.inputBytes!;
      if (this.base === 0 && buf.length < size && this.sink.length > 0)
        this.keeper.room(0, Math.ceil((1.05 * this.sink.length * size) / buf.length));
    }
  }

  /**
   * A node object of a children array starts at offset `i` of `buf`: when the earlier version has one of
   * the same bytes among the next children of this node's counterpart, its nodes are taken (added as
   * reading them would add them) and the offset after it returned; else -1.
   */
  protected override reuse(buf: Buffer, i: number): number {
    if (!this.taking || this.slot !== S_CHILD || this.captures.open.length > 0) return -1;
    const earlier = this.earlier;
    // Whether a node taken is named is not kept: taken only when that cannot change `hasNames`.
    if (!this.hasNames && earlier.named) return -1;
    const list = this.frames[this.depth - 1];
    const sink = this.sink;
    if (sink.length < SAMPLED_NODES) return -1;
    let k = list.oldNext;
    for (let tried = 0; tried < TRIED_CHILDREN && k >= 0; tried++) {
      const bytes = earlier.sameAt(k, buf, i, tried === 0);
      if (bytes >= 0) {
        const room = sink.maxNodes - sink.length;
        if (earlier.count[k] > room) return -1;
        // With the siblings after it that follow alike.
        const last = earlier.lastRepeated(k, buf, i + bytes, room);
        const to = i + (earlier.end[last] - earlier.start[k]);
        this.take(earlier, k, last, list.node);
        list.oldNext = earlier.nextSibling(last);
        // What separates the siblings may hold a line feed; their bits cover their own bytes.
        const bits = earlier.runBits;
        const lines = (bits & K_LINES) !== 0 || (last !== k && earlier.lines);
        this.passOver(buf, i, to, lines, (bits & K_HIGH) !== 0, earlier.runAdjust);
        return to;
      }
      k = earlier.nextSibling(k);
    }
    return -1;
  }

  /**
   * Adds the earlier version's siblings `k` to `last` and their subtrees under node `parent`, as reading
   * them would.
   */
  private take(earlier: KeptJson, k: number, last: number, parent: number): void {
    const sink = this.sink;
    const count = last + earlier.count[last] - k;
    const at = sink.length;
    sink.take(parent, earlier.parentOf, earlier.ownSize, earlier.names, k, count);
    if (at + count > this.sized.length) {
      let length = this.sized.length * 2;
      while (length < at + count) length *= 2;
      const grown = new Uint8Array(length);
      grown.set(this.sized);
      this.sized = grown;
    }
    const sized = this.sized;
    const from = earlier.sized;
    if (count <= 16) for (let t = 0; t < count; t++) sized[at + t] = from[k + t];
    else sized.set(from.subarray(k, k + count), at);
    // Kept fields: "" is no such field where taken (see fieldScalar).
    for (let f = 0; f < this.kept.length && f < earlier.kept.length; f++) {
      const from = earlier.kept[f];
      if (from.length === 0) continue;
      const to = this.kept[f];
      for (let t = 0; t < count; t++) {
        const value = from[k + t];
        if (value !== "") to[at + t] = value;
      }
    }
    this.unkeyed += count;
  }

  // ---------------------------------------------------------------------------------------------------
  // Building nodes.

  /** Adds a node whose value starts at `column` of the current line (where a node too many is reported). */
  private addNode(parent: number, name: string, column: number): number {
    const sink = this.sink;
    if (sink.length >= sink.maxNodes) throw limitExceeded(sink.maxNodes, false, this.pos.line, column);
    const j = sink.add(parent, name, 0);
    if (j === this.sized.length) {
      const grown = new Uint8Array(this.sized.length * 2);
      grown.set(this.sized);
      this.sized = grown;
    }
    this.sized[j] = 0;
    if (this.keeping && j >= this.keeper.count.length) this.keeper.room(j);
    return j;
  }

  /** A scalar value in the current slot, starting at `column` of the current line. */
  private scalar(kind: number, text: string, value: number, column: number): void {
    const top = this.depth - 1;
    switch (this.slot) {
      case S_FIELD:
        this.fieldScalar(this.frames[top], kind, text, value, column);
        return;
      case S_LOOSE_SIZE:
        this.frames[top].looseSize = kind === NUMBER && isSize(value) ? value : 0;
        return;
      case S_KEYED: {
        const j = this.keyedChild(top, column);
        if (kind === NUMBER) {
          if (!isSize(value)) {
            throw this.badSize(text || String(value), j, undefined, { line: this.pos.line, column });
          }
          this.sink.ownSize[j] = value;
          this.sized[j] = 1;
        } else if (kind !== NULL) {
          throw new EspalierError("SHAPE", say`${this.where(j)} must be a node object, a number or null`, {
            line: this.pos.line,
            column,
          });
        }
        return;
      }
      case S_CHILD:
      case S_TOP_ITEM: {
        this.probe.nodes();
        const j = this.addNode(this.slot === S_CHILD ? this.frames[top].node : -1, "", column);
        throw new EspalierError("SHAPE", say`${this.where(j)} must be a node object`, {
          line: this.pos.line,
          column,
        });
      }
      case S_ROW:
        throw this.badRow({ line: this.pos.line, column });
      default:
        throw this.badTop({ line: this.pos.line, column });
    }
  }

  private fieldScalar(frame: Frame, kind: number, text: string, value: number, column: number): void {
    const field = this.fields[this.slotField];
    const i = frame.node;
    if ((field.mask & F_NAME) !== 0 && !frame.keyed) {
      frame.nameKind = kind;
      this.sink.name.setString(i, kind === NUMBER ? numberText(value, text) : text);
    }
    if ((field.mask & F_SIZE) !== 0) {
      frame.sizeKind = kind;
      frame.size = value;
      frame.sizeText = text;
      frame.sizeLine = this.pos.line;
      frame.sizeColumn = column;
    }
    if ((field.mask & F_CHILDREN) !== 0) {
      this.dropChildren(frame);
      frame.childrenKind = kind;
      frame.childrenLine = this.pos.line;
      frame.childrenColumn = column;
    }
    for (const f of field.keeps) {
      const kept = kind === NUMBER ? numberText(value, text) : text;
      this.kept[f][i] = kept;
      // Read back, "" is also no such field (see end): such a node is read again, not taken.
      if (kept === "" && this.keeping) this.keeper.odd(i, this.sink.parentOf);
    }
    if ((field.mask & F_MISSING) !== 0) {
      frame.missing = kind === BOOLEAN && text === "true";
      frame.missingLine = this.pos.line;
      if (frame.missing && this.keeping) this.keeper.odd(i, this.sink.parentOf);
    }
    if ((field.mask & F_VERSION) !== 0) {
      frame.version = kind === STRING;
      frame.versionLine = this.pos.line;
    }
    if ((field.mask & F_OVERRIDDEN) !== 0) frame.overridden = true;
  }

  /** A later children field replaces an earlier one (JSON.parse keeps the last value of a key). */
  private dropChildren(frame: Frame): void {
    if (frame.childrenMark < 0) return;
    if (this.keeping) this.keeper.odd(frame.node, this.sink.parentOf);
    this.repeated(this.options.childrenField);
    this.droppedNodes += this.sink.length - frame.childrenMark;
    if (this.notRead.any) this.notRead.dropFrom(frame.childrenMark);
    this.sink.truncate(frame.childrenMark);
    for (const column of this.kept) column.length = frame.childrenMark;
    frame.childrenMark = -1;
  }

  /** Counts a key repeated where the repeat drops the earlier value's nodes (see `repeats`). */
  private repeated(key: string): void {
    if (this.repeats++ === 0) this.firstRepeat = { key, line: this.pos.line };
  }

  /**
   * REPEATED_KEY: JSON.parse keeps the last value of a repeated key, and so does this reading, so the
   * earlier values' nodes are not in the tree; RFC 8259 section 4 leaves such an object's meaning to
   * each reader ("names within an object SHOULD be unique"), so the reader is told.
   */
  private repeatNote(): ReadingNote {
    const { key, line } = this.firstRepeat!;
    const more =
      this.repeats > 1 ? `, and ${this.repeats - 1} more key${this.repeats > 2 ? "s" : ""} so` : "";
    const nodes = this.droppedNodes === 1 ? "1 node" : `${this.droppedNodes} nodes`;
    return {
      code: "REPEATED_KEY",
      line,
      count: this.repeats,
      parts: say`line ${line} repeats the key ${quoted.name(key)} of its object${more}: as JSON.parse does, the last value is read and the earlier ones (${nodes}) are not; RFC 8259 leaves a repeated key to each reader, so give each key once, or read every value with --read-as values`,
    };
  }

  /**
   * DEDUPED_ENTRIES when some node objects below the top hold a `version` and no `overridden` while
   * others hold one (deduped-entries.ts): as for MISSING_ENTRIES, the first one's line is given unless
   * nodes were dropped or moved. Undefined otherwise.
   */
  private dedupedNote(): ReadingNote | undefined {
    if (!this.overriddenSeen) return undefined;
    const { count, first, line } = this.flagged(DEDUPED, this.dedupedLines);
    return count === 0 ? undefined : dedupedEntriesNote(count, this.where(first), line);
  }

  /**
   * MISSING_ENTRIES when some node objects hold `"missing": true`; the first one's line is given unless
   * a repeated key dropped nodes (it may have been among them). Undefined when none does.
   */
  private missingNote(): ReadingNote | undefined {
    const { count, first, line } = this.flagged(MISSING, this.missingLines);
    return count === 0 ? undefined : missingEntriesNote(count, this.where(first), line);
  }

  /**
   * How many nodes carry the `sized` flag `bit`, the first of them in the tree's order, and its line
   * from `lines` (by node, as read) unless nodes were dropped or moved since (it may not be the first
   * read then).
   */
  private flagged(
    bit: number,
    lines: ReadonlyMap<number, number>,
  ): { count: number; first: number; line?: number } {
    const { sink, sized } = this;
    let count = 0;
    let first = -1;
    for (let i = 0; i < sink.length; i++)
      if ((sized[i] & bit) !== 0) {
        if (count++ === 0) first = i;
      }
    const line = count > 0 && this.droppedNodes === 0 && !this.reordered ? lines.get(first) : undefined;
    return { count, first, line };
  }

  /** Adds the child named by the current key of the children-by-name object at `top`. */
  private keyedChild(top: number, column: number): number {
    const map = this.frames[top];
    const key = this.slotKey;
    const j = this.addNode(map.node, key, column);
    if (map.keys.has(key)) this.repeated(key);
    if (map.keys.has(key) || isArrayIndexKey(key)) map.reorder = true;
    map.keys.add(key);
    map.children.push(j);
    if (this.keeping) this.keeper.odd(j, this.sink.parentOf);
    return j;
  }

  /** Opens an object or array at offset `i` of the chunk, as what the current slot says. */
  protected open(i: number, object: boolean): void {
    const top = this.depth; // index of the new container
    if (top === this.role.length) this.growStack();
    let frame = this.frames[top];
    if (!frame) {
      frame = new Frame();
      this.frames[top] = frame;
    }
    const parentFrame = top > 0 ? this.frames[top - 1] : frame;
    if (
      this.unreadChildrenDepth === top &&
      (this.slot === S_SKIP || (this.slot === S_FIELD && this.fields[this.slotField].other))
    )
      this.unreadChildrenAt = { line: this.pos.line, column: this.pos.columnAt(this.base + i) };
    this.unreadChildrenDepth = -1;
    // A field of the top node (the top-level object, or the first element of a top-level array) that
    // holds an object or array: a sign of more than one node (see `end`).
    if (this.rootContainers.length < 12 && (top === 1 ? this.role[0] === NODE : this.inFirstItem(top))) {
      // Children, and the fields a node is read for (name, size, kept), are no sign of more.
      // An other field kept (LoadOptions.keepOtherFields) is no field a node is read for.
      if (this.slot !== S_FIELD || this.fields[this.slotField].other) this.rootContainers.push(this.rootKey);
    }
    let role = SKIP;
    let slot = S_SKIP;
    if ((this.slot === S_SKIP || this.slot === S_LOOSE_SIZE) && top > 0) {
      // A field of a node object that is not read, or a value inside one: its node objects are counted.
      const up = this.role[top - 1];
      if (up === NODE) this.openLoose();
      if (up === NODE || up === LOOSE) {
        role = LOOSE;
        frame.loose = object ? L_OBJECT : 0;
        frame.looseSize = 0;
      }
    }
    const column = this.pos.columnAt(this.base + i);
    const pos = { line: this.pos.line, column };
    switch (this.slot) {
      case S_TOP:
        if (this.probe.rows && object) throw this.badTop(pos, true);
        if (object) {
          this.probe.nodes();
          role = NODE;
          this.nodeFrame(frame, this.addNode(-1, "", column), false);
          // The top-level node object's counterpart: the earlier version's (kept only when it had one).
          frame.old = this.taking ? 0 : -1;
        } else {
          role = this.probe.rows ? ROWS : TOP_LIST;
          slot = itemSlot[role];
          this.topList = true;
        }
        break;
      case S_TOP_ITEM:
        if (!object) {
          this.scalar(COLLECTION, "", 0, column);
          break;
        }
        if (this.probe.undecided) {
          if (this.sink.length === 0) {
            this.captures.start(C_PROBE, top + 1, i, -1, []);
            this.rowAt(0, pos);
          } else this.probe.nodes();
        }
        role = NODE;
        this.nodeFrame(frame, this.addNode(-1, "", column), false);
        break;
      case S_CHILD: {
        if (!object) this.scalar(COLLECTION, "", 0, column);
        role = NODE;
        const j = this.addNode(parentFrame.node, "", column);
        this.nodeFrame(frame, j, false);
        // Not taken from the earlier version: its counterpart there is found by its name (pairByName).
        frame.pairing = this.taking;
        if (this.keeping) {
          this.keeper.start[j] = this.base + i;
          frame.openLine = this.pos.line;
          frame.openAdjust = this.pos.lineAdjust;
        }
        break;
      }
      case S_KEYED: {
        const j = this.keyedChild(top - 1, column);
        if (!object) {
          throw new EspalierError(
            "SHAPE",
            say`${this.where(j)} must be a node object, a number or null`,
            pos,
          );
        }
        role = NODE;
        this.nodeFrame(frame, j, true);
        break;
      }
      case S_FIELD: {
        const field = this.fields[this.slotField];
        const node = parentFrame.node;
        if ((field.mask & F_NAME) !== 0 && !parentFrame.keyed) {
          parentFrame.nameKind = COLLECTION;
          parentFrame.nameLine = this.pos.line;
          parentFrame.nameColumn = column;
          this.sink.name.setString(node, "");
        }
        if ((field.mask & F_SIZE) !== 0) {
          parentFrame.sizeKind = COLLECTION;
          parentFrame.sizeLine = this.pos.line;
          parentFrame.sizeColumn = column;
        }
        if ((field.mask & F_CHILDREN) !== 0) {
          this.dropChildren(parentFrame);
          parentFrame.childrenKind = COLLECTION;
          parentFrame.childrenMark = this.sink.length;
          role = object ? CHILD_MAP : CHILD_LIST;
          slot = object ? S_SKIP : S_CHILD;
          frame.node = node;
          if (parentFrame.pairing) this.pairByName(parentFrame, this.frames[top - 2]);
          frame.oldNext = !object && parentFrame.old >= 0 ? this.earlier.firstChild(parentFrame.old) : -1;
          if (object) {
            frame.keys.clear();
            frame.children.length = 0;
            frame.reorder = false;
          }
        }
        if (field.keeps.length > 0) {
          this.captures.start(C_KEEP, top + 1, i, node, field.keeps, this.pos.line);
        }
        if ((field.mask & F_MISSING) !== 0) parentFrame.missing = false;
        if ((field.mask & F_VERSION) !== 0) parentFrame.version = false;
        if ((field.mask & F_OVERRIDDEN) !== 0) parentFrame.overridden = true;
        break;
      }
      case S_ROW:
        if (!object) throw this.badRow(pos);
        this.captures.start(C_ROW, top + 1, i, -1, []);
        this.rowAt(this.rows.length, pos);
        break;
    }
    this.role[top] = role;
    this.slot = slot;
  }

  /**
   * A key of node object `node` that no field read matches (`found` -1) or that only marks entries
   * (`missing`, npm's `version`, `overridden`), keeping the other fields (LoadOptions.keepOtherFields):
   * the field it is kept as, taken on when first met, else `found`. Keys that are no other field kept
   * are remembered by their bytes, so that each is decoded once.
   */
  private otherKey(
    found: number,
    bytes: Uint8Array,
    q: number,
    e: number,
    absQ: number,
    node: number,
  ): number {
    if (found < 0 && !this.escaped) {
      const length = e - q - 1;
      for (const known of this.notOther) {
        if (known.length !== length) continue;
        let k = 0;
        while (k < length && bytes[q + 1 + k] === known[k]) k++;
        if (k === length) return found;
      }
    }
    const text = found < 0 ? this.text(bytes, q, e, absQ) : this.fields[found].text;
    if (!this.others!.keeps(text)) {
      if (found >= 0) this.fields[found].settled = true;
      else if (!this.escaped) this.notOther.push(bytes.slice(q + 1, e));
      return found;
    }
    return this.keepOther(text, node, found);
  }

  /** Keeps other field `text` from node `node` on (none before holds it): a kept column, and its field. */
  private keepOther(
    text: string,
    node: number,
    found = this.fields.findIndex((f) => f.text === text),
  ): number {
    this.others?.keeps(text);
    const keep = this.kept.length;
    this.kept.push(new Array<string | undefined>(node));
    this.keptNames.push(text);
    if (found >= 0) {
      this.fields[found].keeps.push(keep);
      this.fields[found].settled = true;
      return found;
    }
    const bytes = new TextEncoder().encode(text);
    this.fields.push({ bytes, text, mask: 0, keeps: [keep], other: true, settled: true });
    return this.fields.length - 1;
  }

  /** Counts the node objects in `value`, kept as the text of field `key` of node `node` (nodes-not-read.ts). */
  private keptNotRead(value: unknown, key: string, node: number, line: number): void {
    const { count, size } = countNodeObjects(value, this.options, plainValues, new Set());
    if (count === 0) return;
    const list = Array.isArray(value);
    const shaped =
      !list &&
      [this.options.nameField, this.options.sizeField, this.options.childrenField].some((f) =>
        Object.hasOwn(value as object, f),
      );
    this.notRead.add(key, node, line, count, size, list ? "list" : shaped ? "node" : "map");
    if (this.keeping) this.keeper.odd(node, this.sink.parentOf);
  }

  /** A field of a node object that is not read opens (an object or array): none of its node objects counted yet. */
  private openLoose(): void {
    this.looseCount = 0;
    this.looseSizes = 0;
    // Copied, not decoded: most such values hold no node object, and their key is never said.
    const { unreadKey, unreadQ } = this;
    const length = this.unreadE - unreadQ + 1;
    if (length > this.looseKey.length) this.looseKey = new Uint8Array(length * 2);
    const key = this.looseKey;
    for (let k = 0; k < length; k++) key[k] = unreadKey[unreadQ + k];
    this.looseKeyLength = length;
    this.looseLine = this.pos.line;
  }

  /**
   * A value not read closes: an object holding a field a node is read for counts as a node object; the
   * whole field value closing adds what it holds to the places (nodes-not-read.ts). A node with such a
   * field is not taken by a later version's load: its node objects are counted where read.
   */
  private closeLoose(frame: Frame, top: number): void {
    const shaped = frame.loose === (L_OBJECT | L_SHAPED);
    if (shaped) {
      this.looseCount++;
      this.looseSizes += frame.looseSize;
    }
    if (this.role[top - 1] !== NODE || this.looseCount === 0) return;
    const node = this.frames[top - 1].node;
    const kind = frame.loose === 0 ? "list" : shaped ? "node" : "map";
    // The key as written, quotes included, is a JSON string the tokenizer has checked.
    const key = JSON.parse(
      new TextDecoder().decode(this.looseKey.subarray(0, this.looseKeyLength)),
    ) as string;
    this.notRead.add(key, node, this.looseLine, this.looseCount, this.looseSizes, kind);
    if (this.keeping) this.keeper.odd(node, this.sink.parentOf);
  }

  /** Whether a container opening at level `top` is a field value of the first element of a top-level array. */
  private inFirstItem(top: number): boolean {
    return top === 2 && this.role[0] === TOP_LIST && this.role[1] === NODE && this.frames[1].node === 0;
  }

  private nodeFrame(frame: Frame, node: number, keyed: boolean): void {
    frame.node = node;
    frame.keyed = keyed;
    frame.nameKind = ABSENT;
    frame.sizeKind = ABSENT;
    frame.childrenKind = ABSENT;
    frame.childrenMark = -1;
    frame.fieldCount = 0;
    frame.missing = false;
    frame.version = false;
    frame.overridden = false;
    frame.old = -1;
    frame.pairing = false;
  }

  /**
   * Node `frame.node`, read (not taken), in the children array whose frame is `list`: its counterpart in
   * the earlier version is the first of the next children there (from the array's cursor on) with its
   * name; the cursor moves past it. None found (an added node, or no name read yet): none, and the
   * cursor stays. Only a guide to what is compared: a node is taken only where the bytes are the same.
   */
  private pairByName(frame: Frame, list: Frame): void {
    const earlier = this.earlier;
    const names = this.sink.name;
    let k = list.oldNext;
    for (let tried = 0; tried < PAIRED_CHILDREN && k >= 0; tried++) {
      if (names.sameBytes(frame.node, earlier.names, k) === true) {
        frame.old = k;
        frame.pairing = false;
        list.oldNext = earlier.nextSibling(k);
        return;
      }
      k = earlier.nextSibling(k);
    }
  }

  /** Closes the innermost container, whose last byte is at offset `i` of `buf`. */
  protected close(buf: Buffer, i: number): void {
    this.unreadChildrenDepth = -1;
    const top = this.depth - 1;
    const frame = this.frames[top];
    const capture = this.captures.closing(top + 1);
    if (capture) {
      const value = this.captures.value(capture, buf, i + 1);
      if (capture.kind === C_PROBE) {
        if (this.probe.decide(value, this.options)) {
          this.sink.truncate(0);
          for (const column of this.kept) column.length = 0;
          this.rows.push(value);
          this.role[top - 1] = ROWS;
          return;
        }
      } else if (capture.kind === C_ROW) {
        this.rows.push(value);
      } else {
        const text = JSON.stringify(value);
        for (const f of capture.keeps) {
          this.kept[f][capture.node] = text;
        }
        // Shown as text, its node objects are no nodes either.
        this.keptNotRead(value, this.keptNames[capture.keeps[0]], capture.node, capture.line);
      }
    }
    const role = this.role[top];
    if (role === NODE) {
      this.closeNode(frame);
      // A node read whose counterpart is not found yet (one with no children): the cursor moves past it.
      if (frame.pairing) this.pairByName(frame, this.frames[top - 1]);
      if (this.keeping) this.keepNode(this.keeper, frame, this.base + i + 1);
    } else if (role === CHILD_MAP) {
      if (frame.reorder) {
        this.reordered = true;
        const mark = this.frames[top - 1].childrenMark;
        this.droppedNodes += reorderKeyedChildren(
          this.sink,
          this.sized,
          this.kept,
          frame.node,
          mark,
          frame.children,
        );
      }
      frame.keys.clear();
      frame.children.length = 0;
    } else if (role === LOOSE) {
      this.closeLoose(frame, top);
    }
  }

  /** Checks a node's fields once all are known (a later repeat of a key replaces an earlier value). */
  private closeNode(frame: Frame): void {
    // The options are read for a message only: a diff's NEW gets an options object of another shape.
    const i = frame.node;
    if (frame.fieldCount === 0) this.sized[i] = EMPTY;
    const nameKind = frame.nameKind;
    if (!frame.keyed) this.unkeyed++;
    if (!frame.keyed && (nameKind === STRING || nameKind === NUMBER || nameKind === BOOLEAN))
      this.hasNames = true;
    if (!frame.keyed && nameKind === COLLECTION) {
      const { nameField } = this.options;
      throw new EspalierError("SHAPE", say`the "${nameField}" of ${this.where(i)} must be text`, {
        line: frame.nameLine,
        column: frame.nameColumn,
      });
    }
    const sizeKind = frame.sizeKind;
    if (sizeKind === NUMBER) {
      const size = frame.size;
      if (!isSize(size)) {
        throw this.badSize(frame.sizeText || String(size), i, undefined, {
          line: frame.sizeLine,
          column: frame.sizeColumn,
        });
      }
      this.sink.ownSize[i] = size;
      this.sized[i] = SIZED;
    } else if (sizeKind !== ABSENT && sizeKind !== NULL) {
      const shownSize = sizeKind === STRING ? quoted.value(frame.sizeText) : "a non-number";
      throw this.badSize(shownSize, i, this.options.sizeField, {
        line: frame.sizeLine,
        column: frame.sizeColumn,
      });
    }
    const childrenKind = frame.childrenKind;
    if (childrenKind === STRING || childrenKind === NUMBER || childrenKind === BOOLEAN) {
      const { childrenField } = this.options;
      throw new EspalierError(
        "SHAPE",
        say`the "${childrenField}" of ${this.where(i)} must be an array or an object keyed by child name`,
        { line: frame.childrenLine, column: frame.childrenColumn },
      );
    }
    if (frame.missing) {
      this.sized[i] |= MISSING;
      this.missingLines.set(i, frame.missingLine);
    }
    // The project's own entry (the top) has a version and no `overridden` in npm's listing too, and a
    // deduped entry no dependencies.
    if (this.npmFields) {
      if (frame.overridden) this.overriddenSeen = true;
      else if (frame.version && frame.childrenKind === ABSENT && this.sink.parentOf[i] !== -1) {
        this.sized[i] |= DEDUPED;
        this.dedupedLines.set(i, frame.versionLine);
      }
    }
  }

  /**
   * Keeps where node object `frame.node` ends (`end`, after its `}`), its subtree's nodes (those added
   * since it opened: all below it) and what its reading did (kept-json.ts).
   */
  private keepNode(keeper: JsonKeeper, frame: Frame, end: number): void {
    // What made it odd (K_ODD) was marked as read: keyed by name, missing, a children key given twice.
    const i = frame.node;
    keeper.end[i] = end;
    keeper.count[i] = this.sink.length - i;
    // Its bytes' lines and columns, for a later load that takes them (JsonTokenizer.passOver).
    const pos = this.pos;
    if (pos.line !== frame.openLine) keeper.flags[i] |= K_LINES | K_HIGH;
    else if (pos.lineAdjust !== frame.openAdjust) keeper.high(i, pos.lineAdjust - frame.openAdjust);
  }

  private growStack(): void {
    const role = new Uint8Array(this.role.length * 2);
    role.set(this.role);
    this.role = role;
  }

  // ---------------------------------------------------------------------------------------------------
  // Messages.

  private where(i: number): MessagePart[] {
    return describeNode(this.sink.parentOf, this.sink.name, i);
  }

  private badSize(
    shown: MessagePart,
    i: number,
    field: string | undefined,
    pos: SourcePos | undefined,
  ): EspalierError {
    return badNodeSize(this.sink.parentOf, this.sink.name, i, shown, field, pos);
  }

  private badTop(pos: SourcePos, object = false): EspalierError {
    if (this.probe.rows)
      return new EspalierError(
        "SHAPE",
        `rows must be a top-level array of objects${object ? ROWS_IN_OBJECT : ""}`,
        pos,
      );
    return new EspalierError("SHAPE", "the top level must be a node object or an array of them", pos);
  }

  private badRow(pos: SourcePos): EspalierError {
    const row = this.rows.length + 1;
    return new EspalierError("SHAPE", `row ${row} must be an object`, { row, ...pos });
  }

  /** Row `r` (0-based) starts at `pos` (its `{`). */
  private rowAt(r: number, pos: { line: number; column: number }): void {
    this.rowLines[r] = pos.line;
    this.rowColumns[r] = pos.column;
  }
}

/**
 * What SHAPE adds when rows were asked for and the document is an object: an API's `{"data": [...]}`
 * or a dataset's `{"3166-2": [...]}` holds its rows under a member, which espalier does not pick.
 */
export const ROWS_IN_OBJECT =
  "; this document is an object: rows held under one of its members are read with --start-at and the JSON Pointer of that array (as --start-at /data); without --input-format rows, the object is read as nested nodes";

/**
 * A number name or kept field as text: as JSON.parse reads it (`7e0` is "7", `1.10` is "1.1"), except a
 * whole number past 2^53 - 1, which a double keeps only to about 16 digits (RFC 8259 §6): it keeps its
 * digits as written (`written`, which `number` gives for every number that is no size), so
 * 12345678901234567891 and 12345678901234567892 stay two names, and a change between them an edit.
 */
function numberText(value: number, written: string): string {
  return Number.isInteger(value) && !Number.isSafeInteger(value) && written !== "" ? written : String(value);
}
