import type { Columns } from "./engine.js";

/**
 * A materialized result of the engine's package, as far as resultColumns uses it:
 * its columns' names and its chunks of rows, each column of a chunk a vector.
 */
export interface ChunkedResult {
  readonly columnCount: number;
  columnName(column: number): string;
  readonly chunkCount: number;
  getChunk(chunk: number): {
    readonly rowCount: number;
    getColumnVector(column: number): EngineVector;
  };
}

/** A vector of the engine's package: what every vector has, and what resultColumns reads directly. */
export interface EngineVector {
  readonly type: { readonly typeId: number };
  readonly itemCount: number;
  getItem(item: number): unknown;
  /** Numbers of a fixed-width numeric vector, in a typed array over the engine's memory. */
  readonly items?: ArrayLike<number | bigint>;
  /** Strings of a VARCHAR vector: 16 bytes each (length, then the bytes inline or a pointer). */
  readonly dataView?: DataView;
  /** Valid-bit words, or null when every item is valid. */
  readonly validity?: { readonly data: BigUint64Array | null };
}

/** Type ids of the engine's C API (duckdb.h, enum DUCKDB_TYPE) read here without getItem. */
const TYPE = {
  TINYINT: 2,
  SMALLINT: 3,
  INTEGER: 4,
  BIGINT: 5,
  UTINYINT: 6,
  USMALLINT: 7,
  UINTEGER: 8,
  UBIGINT: 9,
  FLOAT: 10,
  DOUBLE: 11,
  HUGEINT: 16,
  VARCHAR: 17,
} as const;

const SMALL_NUMBERS: ReadonlySet<number> = new Set([
  TYPE.TINYINT,
  TYPE.SMALLINT,
  TYPE.INTEGER,
  TYPE.UTINYINT,
  TYPE.USMALLINT,
  TYPE.UINTEGER,
  TYPE.FLOAT,
  TYPE.DOUBLE,
]);

const decoder = new TextDecoder();

/** The engine's vectors are in the machine's byte order; read directly only where that is little-endian. */
const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/**
 * A result's values column by column, as Engine.run hands them out: NULL as null, 32-bit and smaller
 * numbers and doubles as numbers, 64- and 128-bit integers as numbers while they are exact
 * (|v| ≤ 2^53 - 1), as bigint beyond, text as strings, anything else as the package converts it (`getItem`). The same values
 * the package's own `getColumnsJS` gives, read without an object or a call per value where the vector's
 * memory can be read directly: a short text (12 bytes or fewer, stored inline) repeated in the rows
 * before it is the same string, ASCII text is made from its bytes, numbers are copied from the vector.
 */
export function resultColumns(result: ChunkedResult): Columns {
  const names: string[] = [];
  for (let c = 0; c < result.columnCount; c++) names.push(result.columnName(c));
  const total = (result as { rowCount?: unknown }).rowCount;
  const values: unknown[][] = names.map(() => (typeof total === "number" ? new Array(total) : []));
  let rowCount = 0;
  for (let k = 0; k < result.chunkCount; k++) {
    const chunk = result.getChunk(k);
    const n = chunk.rowCount;
    for (let c = 0; c < names.length; c++) readVector(chunk.getColumnVector(c), n, values[c], rowCount);
    rowCount += n;
  }
  return { names, values, rowCount };
}

/** Items 0..n-1 of `vector` into `out` from index `at`. */
function readVector(vector: EngineVector, n: number, out: unknown[], at: number): void {
  const typeId = vector.type.typeId;
  if (!LITTLE_ENDIAN) {
    for (let i = 0; i < n; i++) out[at + i] = vector.getItem(i);
    return;
  }
  const valid = validBits(vector);
  const { items, dataView } = vector;
  if (items !== undefined && items.length >= n && SMALL_NUMBERS.has(typeId)) {
    for (let i = 0; i < n; i++) out[at + i] = isValid(valid, i) ? items[i] : null;
    return;
  }
  if (items !== undefined && items.length >= n && (typeId === TYPE.BIGINT || typeId === TYPE.UBIGINT)) {
    // 64-bit items as 32-bit words, low word first: a whole number below 2^53 needs no bigint.
    const words = new Uint32Array(
      (items as BigInt64Array).buffer,
      (items as BigInt64Array).byteOffset,
      n * 2,
    );
    for (let i = 0; i < n; i++) {
      if (!isValid(valid, i)) out[at + i] = null;
      else if (words[2 * i + 1] < 0x200000) out[at + i] = words[2 * i + 1] * 0x100000000 + words[2 * i];
      else out[at + i] = exactNumber(items[i] as bigint);
    }
    return;
  }
  if (typeId === TYPE.HUGEINT && dataView instanceof DataView && dataView.byteLength >= n * 16) {
    // 128-bit items: the low 64 bits, then the high 64 (signed), each as two 32-bit words, low first.
    const words = new Uint32Array(dataView.buffer, dataView.byteOffset, n * 4);
    for (let i = 0; i < n; i++) {
      const w = 4 * i;
      if (!isValid(valid, i)) out[at + i] = null;
      else if (words[w + 3] === 0 && words[w + 2] === 0 && words[w + 1] < 0x200000)
        out[at + i] = words[w + 1] * 0x100000000 + words[w];
      else out[at + i] = exactNumber(vector.getItem(i) as bigint);
    }
    return;
  }
  if (typeId === TYPE.VARCHAR && dataView instanceof DataView && dataView.byteLength >= n * 16) {
    readText(vector, dataView, n, valid, out, at);
    return;
  }
  for (let i = 0; i < n; i++) out[at + i] = vector.getItem(i);
}

/**
 * A VARCHAR vector's strings. Each item is 16 bytes: a 32-bit length, then up to 12 bytes of text
 * inline, or (longer) a 4-byte prefix and a pointer, which only the package can follow (getItem).
 */
function readText(
  vector: EngineVector,
  view: DataView,
  n: number,
  valid: Uint32Array | undefined,
  out: unknown[],
  at: number,
): void {
  const bytes = new Uint8Array(view.buffer, view.byteOffset, n * 16);
  let last: string | undefined;
  let lastItem = -1;
  for (let i = 0; i < n; i++) {
    if (!isValid(valid, i)) {
      out[at + i] = null;
      continue;
    }
    const base = i * 16;
    const length = view.getUint32(base, true);
    if (length > 12) {
      out[at + i] = vector.getItem(i);
      continue;
    }
    if (lastItem >= 0 && sameInline(bytes, lastItem * 16, base, length)) {
      out[at + i] = last;
      continue;
    }
    let ascii = true;
    for (let b = 0; b < length; b++) if (bytes[base + 4 + b] > 0x7f) ascii = false;
    const text = ascii
      ? String.fromCharCode.apply(null, bytes.subarray(base + 4, base + 4 + length) as unknown as number[])
      : decoder.decode(bytes.subarray(base + 4, base + 4 + length));
    out[at + i] = text;
    last = text;
    lastItem = i;
  }
}

/** Whether item i is valid (not NULL), by the valid bits of validBits. */
function isValid(valid: Uint32Array | undefined, i: number): boolean {
  return valid === undefined || (valid[i >>> 5] & (1 << (i & 31))) !== 0;
}

/** A big integer as a number where that is exact (|v| ≤ 2^53 - 1), else as it is. */
function exactNumber(value: bigint): number | bigint {
  const small = Number(value);
  return Number.isSafeInteger(small) ? small : value;
}

/** Whether the inline items at byte offsets `a` and `b` hold the same text of `length` bytes. */
function sameInline(bytes: Uint8Array, a: number, b: number, length: number): boolean {
  for (let k = 0; k < 4 + length; k++) if (bytes[a + k] !== bytes[b + k]) return false;
  return true;
}

/** The vector's valid bits as 32-bit words (bit i of the vector: word i >> 5, bit i & 31), or undefined when all are valid. */
function validBits(vector: EngineVector): Uint32Array | undefined {
  const data = vector.validity?.data;
  if (data === null || data === undefined) return undefined;
  // The engine's words are little-endian 64-bit; on a little-endian machine their low half comes first.
  return new Uint32Array(data.buffer, data.byteOffset, data.length * 2);
}
