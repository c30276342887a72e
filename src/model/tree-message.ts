import { NamePool, type NamePoolParts, type Names, StringNames } from "./names.js";
import type { Tree, TreeReading } from "./tree.js";

/**
 * A {@link Tree} as plain data that a worker thread can post. Structured clone copies the arrays
 * unless their buffers go in the transfer list ({@link treeTransferList}): then they move.
 */
export interface TreeMessage {
  length: number;
  parent: Int32Array;
  depth: Int32Array;
  name: NamesMessage;
  ownSize: Float64Array;
  hasSizes: boolean;
  ids: NamesMessage | null;
  origin: Int32Array;
  originIsRow: boolean;
  fields: [string, readonly string[]][];
  syntheticRoot: boolean;
  referenceTo?: Int32Array;
  reading?: TreeReading;
  empty?: Uint8Array;
}

type NamesMessage = { pool: NamePoolParts } | { strings: string[] };

export function treeToMessage(tree: Tree): TreeMessage {
  return {
    ...tree,
    name: namesToMessage(tree.name),
    ids: tree.ids === null ? null : namesToMessage(tree.ids),
    fields: [...tree.fields],
  };
}

/**
 * The buffers under a message's arrays, each once, for postMessage's transfer list: the arrays move to
 * the receiving thread instead of being copied (the sender can no longer read them). A buffer the
 * engine will not move (Node's shared pool for small Buffers) is copied as before.
 */
export function treeTransferList(message: TreeMessage): ArrayBuffer[] {
  const arrays: ArrayBufferView[] = [message.parent, message.depth, message.ownSize, message.origin];
  if (message.referenceTo) arrays.push(message.referenceTo);
  if (message.empty) arrays.push(message.empty);
  for (const names of [message.name, message.ids])
    if (names !== null && "pool" in names) arrays.push(names.pool.bytes, names.pool.start, names.pool.size);
  const buffers = new Set<ArrayBuffer>();
  for (const a of arrays) if (a.buffer instanceof ArrayBuffer) buffers.add(a.buffer);
  return [...buffers];
}

export function treeFromMessage(message: TreeMessage): Tree {
  return {
    ...message,
    name: namesFromMessage(message.name),
    ids: message.ids === null ? null : namesFromMessage(message.ids),
    fields: new Map(message.fields),
  };
}

function namesToMessage(names: Names): NamesMessage {
  if (names instanceof NamePool) return { pool: names.toParts() };
  const strings: string[] = new Array(names.length);
  for (let i = 0; i < names.length; i++) strings[i] = names.get(i);
  return { strings };
}

function namesFromMessage(message: NamesMessage): Names {
  return "pool" in message ? NamePool.fromParts(message.pool) : new StringNames(message.strings);
}
