import { NamePool, type NamePoolParts, type Names, StringNames } from "./names.js";
import type { Tree } from "./tree.js";

/** A {@link Tree} as plain data that a worker thread can post (structured clone copies the arrays). */
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
