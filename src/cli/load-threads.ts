import { EspalierError } from "../errors.js";

/** Environment variable that sets how many threads a diff loads its two versions on: `1`, `2`, or unset. */
export const LOAD_THREADS_ENV = "ESPALIER_LOAD_THREADS";

/** What the launcher reads of the machine when a diff starts. */
export interface MachineLoad {
  /** Processors this process may use. */
  cores: number;
  /** The one-minute load average: processes running or waiting for a processor, on average. */
  load: number;
}

/**
 * Idle processors a second thread needs before it pays: the main thread takes one, the worker another,
 * with half a processor of room (a one-minute average lags the moment).
 */
const IDLE_FOR_TWO = 1.5;

/**
 * On how many threads a diff loads its two versions: 2 (OLD on a worker while NEW loads here) or 1 (one
 * after the other). Two threads halve the wait only when a second processor is idle; when none is,
 * the loads take turns on the processors anyway, and the worker costs more work than it saves: its own
 * engine to start and warm up, and its own memory, fresh to the process (on the development machine a
 * 1M-node JSON diff took about 0.35 s more processor time on two threads: docs/performance.md). So
 * unset, the machine decides: two threads when `cores - load >= 1.5`; without a reading, two.
 * `setting` is the value of {@link LOAD_THREADS_ENV}: `1` or `2` decide instead.
 */
export function loadThreads(setting: string | undefined, machine: MachineLoad | undefined): 1 | 2 {
  if (setting === "1") return 1;
  if (setting === "2") return 2;
  if (setting !== undefined && setting !== "")
    throw new EspalierError(
      "USAGE",
      `${LOAD_THREADS_ENV} is "${setting}": give 1 (load a diff's versions one after the other) or 2 (at once, on two threads), or leave it unset to decide by the machine's load`,
    );
  if (machine === undefined) return 2;
  return machine.cores - machine.load >= IDLE_FOR_TWO ? 2 : 1;
}
