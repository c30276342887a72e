import { EspalierError, type SourcePos } from "../errors.js";

/**
 * How much of one piece of input a reader holds before it has the whole piece: an endless or enormous
 * line, record or token (`/dev/zero` as input, a string that never closes) ends in LIMIT_EXCEEDED at its
 * place instead of growing memory without bound. Each limit is far past anything a real tree needs.
 */
export interface ReadLimits {
  /** Bytes of one line of a path list, or one record of a CSV or TSV file. */
  maxLineBytes: number;
  /** Bytes of one JSON string or number, and of one value kept whole (a label field, a row). */
  maxTokenBytes: number;
  /** Levels of JSON nesting (a node is two: its object and its children's array or object). */
  maxJsonDepth: number;
  /** Bytes of a YAML input: its parser reads the whole document before espalier sees a node. */
  maxYamlBytes: number;
  /**
   * Bytes of a JSON graph (`--graph`: an adjacency map or rows whose ids repeat): it is parsed whole,
   * and its parsed values take several times its bytes.
   */
  maxJsonGraphBytes: number;
  /** Bytes of a config file (`.espalier.yaml`, `--config`). */
  maxConfigBytes: number;
  /** Bytes of a `--focus-from` file. */
  maxFociBytes: number;
}

const MiB = 1 << 20;

/** The limits in force; `LoadOptions.limits` may lower them (tests and the fuzzer do). */
export const readLimits: Readonly<ReadLimits> = {
  maxLineBytes: 4 * MiB,
  maxTokenBytes: 16 * MiB,
  maxJsonDepth: 4 * MiB,
  maxYamlBytes: 64 * MiB,
  maxJsonGraphBytes: 256 * MiB,
  maxConfigBytes: 1 * MiB,
  maxFociBytes: 64 * MiB,
};

/** The limits with `overrides` applied. */
export function limitsOf(overrides: Partial<ReadLimits> | undefined): ReadLimits {
  return overrides === undefined ? readLimits : { ...readLimits, ...overrides };
}

/** LIMIT_EXCEEDED for a JSON graph past `limit` bytes (held whole to be parsed): the whole file is at fault. */
export function jsonGraphTooLong(limit: number): EspalierError {
  return new EspalierError(
    "LIMIT_EXCEEDED",
    `a JSON graph (an adjacency map or rows with repeated ids) is read whole, and this one is longer than ${limit} bytes (maxJsonGraphBytes); write it as an edge list or an edge table, which stream`,
  );
}

/** LIMIT_EXCEEDED for a piece of input past `limit` bytes: `what` names it ("a line", "a JSON string"). */
export function tooLong(what: string, limit: number, pos?: SourcePos): EspalierError {
  return new EspalierError(
    "LIMIT_EXCEEDED",
    `${what} is longer than ${limit} bytes, more than any tree needs (an endless input, such as a device?)`,
    pos,
  );
}
