import { Worker } from "node:worker_threads";
import { EspalierError, type EspalierErrorData } from "../errors.js";
import type { LoadOptions } from "../load/load-options.js";
import type { Tree } from "../model/tree.js";
import { type TreeMessage, treeFromMessage } from "../model/tree-message.js";

type Reply = { tree: TreeMessage } | { error: EspalierErrorData } | { failure: string };

/**
 * Loads a named file on another thread (`load-worker.ts`), so that two versions of a diff load at the
 * same time on two cores. The tree's arrays come back moved, not copied (a transfer list); a load error comes back as the same
 * {@link EspalierError}; anything else (the thread died) is an Error.
 */
export function loadInWorker(name: string, options: LoadOptions): Promise<Tree> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(new URL("./load-worker.js", import.meta.url), {
      workerData: { name, options },
    });
    let settled = false;
    worker.once("message", (reply: Reply) => {
      settled = true;
      if ("tree" in reply) resolve(treeFromMessage(reply.tree));
      else if ("error" in reply) reject(EspalierError.fromData(reply.error));
      else reject(new Error(reply.failure));
      void worker.terminate();
    });
    worker.once("error", (err: Error & { code?: string }) => {
      if (!settled)
        reject(
          err.code === "ERR_WORKER_OUT_OF_MEMORY"
            ? new EspalierError("LIMIT_EXCEEDED", `${name} is too big to load in the memory available`)
            : err,
        );
      settled = true;
    });
    worker.once("exit", (code) => {
      if (!settled)
        reject(new Error(`the loading thread stopped (exit ${code}) before it had loaded ${name}`));
      settled = true;
    });
  });
}
