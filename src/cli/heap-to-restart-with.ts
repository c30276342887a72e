const MiB = 2 ** 20;

/** What the launcher knows before loading anything. */
export interface HeapFacts {
  /** The engine's current heap limit, in bytes. */
  heapLimit: number;
  /** Physical memory, in bytes. */
  totalMemory: number;
  /** Size in bytes of each input named on the command line; undefined for a pipe of unknown length. */
  inputBytes: readonly (number | undefined)[];
  /** The command line's arguments, when known: a fact table rolled up by the SQL engine never restarts. */
  args?: readonly string[];
}

/** Heap per byte of input, with room: CSV tables peak near 14x their size, JSON and path lists below. */
const HEAP_PER_BYTE = 16;
/** Heap to assume for a pipe: what ten million nodes take. */
const PIPE_MIB = 4096;
/** Share of physical memory the heap may grow to. */
const RAM_SHARE = 0.75;

/**
 * The heap limit (MiB) to restart the command with, or 0 to run in this process: the inputs' sizes tell
 * how much heap the load will need; when that is more than the engine's default limit and physical
 * memory has room, the command restarts itself with a larger limit (so the user never passes engine
 * flags). Small inputs never pay for a restart.
 */
export function heapToRestartWith(facts: HeapFacts): number {
  if (facts.args !== undefined && rolledUpByEngine(facts.args)) return 0;
  let need = 256;
  for (const bytes of facts.inputBytes)
    need += bytes === undefined ? PIPE_MIB : (HEAP_PER_BYTE * bytes) / MiB;
  const target = Math.floor(Math.min(need, (facts.totalMemory * RAM_SHARE) / MiB));
  return target > facts.heapLimit / MiB ? target : 0;
}

/**
 * Whether the arguments make the inputs fact tables that the SQL engine rolls up (--levels or
 * --key-field, not --rolled-up): the engine reads the rows, under its own memory cap, and the heap
 * holds one row per node it hands back, whatever the file's size. A restart would only add a second
 * start of Node and espalier (the engine's library allocates with its own jemalloc, which the
 * restart's allocator settings in bin/espalier.js do not reach).
 */
function rolledUpByEngine(args: readonly string[]): boolean {
  const given = (name: string) => args.some((a) => a === name || a.startsWith(`${name}=`));
  return (given("--levels") || given("--key-field")) && !given("--rolled-up");
}
