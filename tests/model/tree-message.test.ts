import { MessageChannel, receiveMessageOnPort } from "node:worker_threads";
import { describe, expect, it } from "vitest";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import { namesToArray } from "../../src/model/names.js";
import {
  type TreeMessage,
  treeFromMessage,
  treeToMessage,
  treeTransferList,
} from "../../src/model/tree-message.js";
import { opts } from "../load/helpers.js";
import { utf8 } from "../load/stream/helpers.js";

async function* once(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
  yield bytes;
}

describe("treeTransferList(message)", () => {
  it("moves a loaded tree's arrays through a port: the receiver reads the same tree, the sender's are detached", async () => {
    const csv = "id,parent,name,size\n1,,root,4\n2,1,ledger,7\n3,1,Ærø,1\n4,2,a~b/c,2\n";
    const load = () => loadTreeFromStream(once(utf8(csv)), opts({ format: "csv" }));
    const tree = await load();
    const message = treeToMessage(tree);
    const transfer = treeTransferList(message);
    expect(new Set(transfer).size).toBe(transfer.length);
    const { port1, port2 } = new MessageChannel();
    port1.postMessage(message, transfer);
    const got = treeFromMessage(receiveMessageOnPort(port2)!.message as TreeMessage);
    port1.close();
    // Moved, not copied: the sender's parent array no longer has its buffer.
    expect(tree.parent.length).toBe(0);
    const again = await load();
    expect([...got.parent]).toEqual([...again.parent]);
    expect([...got.depth]).toEqual([...again.depth]);
    expect([...got.ownSize]).toEqual([...again.ownSize]);
    expect(namesToArray(got.name)).toEqual(namesToArray(again.name));
    expect(namesToArray(got.ids!)).toEqual(namesToArray(again.ids!));
  });
});
