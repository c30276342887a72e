import { openSync } from "node:fs";
import { ReadStream } from "node:tty";
import { prepareDiff } from "../diff/diff-trees.js";
import { EspalierError } from "../errors.js";
import { commandLine } from "../explore/command-line.js";
import { configText, focusListText, isConfigName } from "../explore/foci-file.js";
import { decodeKeys } from "../explore/keys.js";
import { draw } from "../explore/screen.js";
import { diffSession, type Session, summarySession } from "../explore/session.js";
import type { ExploreState } from "../explore/state.js";
import { ENTER, frame, LEAVE } from "../explore/terminal.js";
import {
  type ExploreEvent,
  needsWork,
  STATUS_ROWS,
  specFoci,
  startState,
  update,
} from "../explore/update.js";
import { warmFits } from "../explore/warm.js";
import { resolveSpecs } from "../focus/resolve-specs.js";
import type { Tree } from "../model/tree.js";
import { palette } from "../render/palette.js";
import { prepare } from "../summarize.js";
import { loadCompared } from "./compared-fields.js";
import { comparisonNotes } from "./comparison-notes.js";
import { CONFIG_BOUND } from "./config.js";
import { EXIT } from "./exit-codes.js";
import { loadInput, pseudonymKey, readFoci, unmatchedWarning } from "./input.js";
import type { CliIO } from "./io.js";
import { type SummaryCliOptions, summaryOptionsSchema } from "./options.js";
import { comparedSaid, outputSettings, unitsFor, useColour } from "./output-settings.js";
import { flagsByKey } from "./parse-command-line.js";
import { inputFacts } from "./renderers.js";
import { writeOutput } from "./write-output.js";

/** How the command was set up, beyond its options. */
export interface ExploreSetup {
  /** The config file read, if any (the default file `w` offers). */
  configFile?: string;
  /** Whether the config file sets the importance (the printed command line then always names it). */
  configSetsImportance?: boolean;
  /** The terminal to draw on; the process's own by default. */
  terminal?: Terminal;
}

/** Loads the input (or both versions), runs the view until it is left; returns what to print. */
export async function exploreCommand(
  input: string,
  newInput: string | undefined,
  opts: SummaryCliOptions,
  io: CliIO,
  setup: ExploreSetup = {},
): Promise<{ text: string; exitCode: number }> {
  if (!io.stdout.isTTY)
    throw new EspalierError(
      "USAGE",
      "espalier explore draws on a terminal, and standard output is not one; run espalier without explore to print a summary",
    );
  const inputs = newInput === undefined ? [input] : [input, newInput];
  const foci = await readFoci(io, opts, inputs);
  const key = pseudonymKey(opts, io);
  // The unit of size follows the loaded tree (file sizes and a document's bytes print as bytes).
  const look = (tree: Tree) => ({
    units: unitsFor(opts, tree),
    label: opts.label,
    chains: opts.chains,
    pseudonymKey: key,
    palette: palette(useColour(opts, io)),
  });
  let session: Session;
  if (newInput === undefined) {
    const tree = await loadInput(io, input, opts);
    // The header says of the input what `espalier` says (what the size measures, the reading chosen…).
    const facts = inputFacts(outputSettings(opts, io, tree));
    session = summarySession(prepare(tree), { ...look(tree), inputFacts: facts });
  } else {
    // Loaded and compared as `espalier diff` without --compare-field does, so the command p prints
    // shows what the view did.
    const compared = await loadCompared(io, input, newInput, { ...opts, compareField: [] });
    const [oldTree, newTree] = compared.trees;
    const compareFields = compared.fields;
    const prepared = prepareDiff(oldTree, newTree, { compareFields, fieldsOptional: compared.optional });
    // Before the view takes the screen, as espalier diff says it: the note stays on the terminal after it.
    const versions = comparisonNotes(prepared, [oldTree, newTree], [input, newInput], io, key);
    // The header says of the inputs what `espalier diff` says (the reading chosen, the fields compared…).
    const settings = {
      ...outputSettings(opts, io, prepared.combined.tree, versions),
      compared: comparedSaid(compareFields, [oldTree, newTree]),
    };
    session = diffSession(prepared, { ...look(prepared.combined.tree), inputFacts: inputFacts(settings) });
  }
  const resolved = resolveSpecs(session.index, foci, key, opts.unmatchedFoci);
  // Before the view takes the screen: the warning stays on the terminal after it.
  if (resolved.unmatched.length > 0) io.stderr.write(unmatchedWarning(resolved.unmatched));
  const given = resolved.foci;
  // The terminal is taken only once the input has loaded and its foci resolved: an error in either is
  // reported on the untouched terminal, like any command's.
  const terminal = setup.terminal ?? nodeTerminal(input === "-" || newInput === "-");
  const size = () => ({
    rows: terminal.rows(),
    cols: Math.min(opts.width ?? Number.POSITIVE_INFINITY, terminal.cols()),
  });
  const start = startState(session, {
    ...size(),
    foci: given,
    importance: opts.importance,
    fociFile:
      opts.focusFrom !== undefined && opts.focusFrom !== "-"
        ? opts.focusFrom
        : (setup.configFile ?? "foci.txt"),
  });
  const colour = useColour(opts, io);
  const end = await runView(session, start, terminal, colour, {
    size,
    write: (file, state) => writeFoci(io, session, state, file, inputs, key !== undefined),
  });
  if (end.kind === "interrupt") return { text: "", exitCode: EXIT.interrupted };
  if (end.kind === "quit") return { text: "", exitCode: EXIT.ok };
  const head = ["espalier", ...(newInput === undefined ? [] : ["diff"]), ...inputs, ...shapeArgs(opts)];
  const importance = end.state.spec.importance;
  const tail = importance !== "depth" || setup.configSetsImportance ? ["--importance", importance] : [];
  const paths = [...specFoci(end.state.spec)].map((i) => session.pathOf(i));
  return {
    text: `${commandLine(head, paths, end.state.rows - STATUS_ROWS, tail, session.headerLines === 0)}\n`,
    exitCode: EXIT.ok,
  };
}

/** Options the printed command line sets itself, or that do not change what it prints. */
const NOT_PRINTED = new Set([
  "focus",
  "focusFrom",
  "budget",
  "importance",
  "format",
  "output",
  "width",
  "color",
  "printSql",
  "sqlTable",
]);

/**
 * The options that shape the tree, its labels and its numbers, as arguments, where they differ from
 * the defaults (whether they came from flags or a config file, so the line stands on its own).
 */
function shapeArgs(opts: SummaryCliOptions): string[] {
  const defaults: Record<string, unknown> = summaryOptionsSchema.parse({});
  const args: string[] = [];
  for (const [key, value] of Object.entries(opts)) {
    if (NOT_PRINTED.has(key) || value === undefined || value === defaults[key]) continue;
    const flags = flagsByKey.get(key);
    if (!flags) continue;
    if (flags.switchValue !== undefined) {
      if (value === flags.switchValue) args.push(flags.long);
    } else if (Array.isArray(value)) for (const v of value) args.push(flags.long, String(v));
    else args.push(flags.long, String(value));
  }
  return args;
}

/** Writes the view's foci to `file`: a config file when it is named *.yaml or *.yml, else a list. */
async function writeFoci(
  io: CliIO,
  session: Session,
  state: ExploreState,
  file: string,
  inputs: string[],
  hidden: boolean,
): Promise<ExploreEvent> {
  const foci = [...specFoci(state.spec)].map((i) => session.pathOf(i));
  const what = { foci, budget: state.rows - STATUS_ROWS, importance: state.spec.importance };
  try {
    let text: string;
    if (isConfigName(file)) {
      let existing: string | null = null;
      try {
        // Bounded as any config: a file written here may be a link to a device.
        existing = new TextDecoder().decode(await io.readFile(file, CONFIG_BOUND));
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== "ENOENT") throw err;
      }
      text = configText(existing, what);
    } else text = focusListText(what);
    // Never over the tree being explored.
    await writeOutput(file, text, inputs, io.outputFiles);
    return { kind: "written", file, foci: foci.length };
  } catch (err) {
    // A YAML error may quote the file, and the file may hold real names: under --pseudonymize the screen
    // says only what kind of failure it was.
    const reason =
      err instanceof EspalierError
        ? hidden
          ? `${err.code} (details hidden under --pseudonymize)`
          : err.message
        : ((err as NodeJS.ErrnoException).code ?? "failed");
    return { kind: "write-failed", file, reason };
  }
}

/** What the view needs of a terminal; the process's own in use, a fake one in tests. */
export interface Terminal {
  rows(): number;
  cols(): number;
  write(text: string): void;
  /** Raw mode on and key bytes to `onBytes`, size changes to `onResize`. */
  start(onBytes: (bytes: Uint8Array) => void, onResize: () => void): void;
  /** Raw mode off, listeners removed. Safe to call twice, and from an exit handler (synchronous). */
  stop(): void;
}

/** How the view ended: the key that left it, and the last state. */
type Ending = { kind: "quit" | "print" | "interrupt"; state: ExploreState };

interface Effects {
  size(): { rows: number; cols: number };
  write(file: string, state: ExploreState): Promise<ExploreEvent>;
}

/**
 * Runs the view: enters the alternate screen, draws every state, feeds keys and resizes to `update`,
 * and restores the terminal exactly (screen, cursor, raw mode) however it ends: a key, an error (then
 * rethrown), a signal (then raised again), or the process exiting.
 */
export function runView(
  session: Session,
  start: ExploreState,
  terminal: Terminal,
  colour: boolean,
  effects: Effects,
): Promise<Ending> {
  return new Promise<Ending>((resolve, reject) => {
    let state = start;
    let done = false;
    // A file being written when the view is left is finished first.
    let pending: Promise<unknown> = Promise.resolve();
    const signals = ["SIGINT", "SIGTERM", "SIGHUP"] as const;
    const onSignal = (signal: NodeJS.Signals) => {
      leave();
      process.kill(process.pid, signal);
    };
    const onCrash = (err: unknown) => {
      leave();
      reject(err);
    };
    const onExit = () => leave();
    function leave() {
      if (done) return;
      done = true;
      terminal.write(LEAVE);
      terminal.stop();
      for (const s of signals) process.off(s, onSignal);
      process.off("uncaughtException", onCrash);
      process.off("exit", onExit);
    }
    const paint = () => terminal.write(frame(draw(session, state, colour).rows));
    let schedule = () => {};
    const dispatch = (event: ExploreEvent) => {
      if (done) return;
      try {
        state = update(session, state, event);
        const request = state.request;
        if (request !== null && request.kind !== "write") {
          leave();
          const ending: Ending = { kind: request.kind, state };
          void pending.then(() => resolve(ending));
          return;
        }
        paint();
        schedule();
        if (request?.kind === "write") pending = effects.write(request.file, state).then(dispatch, onCrash);
      } catch (err) {
        onCrash(err);
      }
    };
    for (const s of signals) process.on(s, onSignal);
    process.on("uncaughtException", onCrash);
    process.on("exit", onExit);
    try {
      terminal.write(ENTER);
      terminal.start(
        (bytes) => {
          for (const key of decodeKeys(bytes)) dispatch(key);
        },
        () => dispatch({ kind: "resize", ...effects.size() }),
      );
      paint();
    } catch (err) {
      onCrash(err);
      return;
    }
    // Between keys: the views the first keys likely ask for are fitted once (warm.ts), pseudonyms are
    // hashed in slices (so a search can cover every name), and a search's matches are counted in
    // slices; a key always comes before the next slice.
    let queued = false;
    let warm = false;
    const quiet = () => {
      queued = false;
      if (done) return;
      if (!warm) {
        warm = true;
        try {
          warmFits(session, state);
        } catch (err) {
          onCrash(err);
          return;
        }
      }
      if (session.search.searchable < session.tree.length) session.search.advance(400);
      if (needsWork(session, state)) dispatch({ kind: "work" });
      schedule();
    };
    schedule = () => {
      if (done || queued) return;
      if (!warm || session.search.searchable < session.tree.length || needsWork(session, state)) {
        queued = true;
        setImmediate(quiet);
      }
    };
    schedule();
  });
}

/**
 * The process's terminal: standard output to draw on; keys from standard input, or from the
 * controlling terminal (/dev/tty) when standard input carries the data or is not a terminal.
 */
function nodeTerminal(stdinIsData: boolean): Terminal {
  let keys: NodeJS.ReadStream & { setRawMode?: (on: boolean) => unknown; isTTY?: boolean };
  let own = false;
  if (!stdinIsData && process.stdin.isTTY) keys = process.stdin;
  else {
    try {
      keys = new ReadStream(openSync("/dev/tty", "r"));
      own = true;
    } catch {
      throw new EspalierError("USAGE", "espalier explore reads keys from a terminal, and none is open");
    }
  }
  const out = process.stdout;
  let onData: ((b: Buffer) => void) | undefined;
  let onResize: (() => void) | undefined;
  return {
    rows: () => out.rows ?? 24,
    cols: () => out.columns ?? 80,
    // A terminal is written synchronously on POSIX systems (Node's process I/O notes), so a frame, or the
    // restoring sequence in an exit handler, is out before the next key or the exit.
    write: (text) => {
      out.write(text);
    },
    start(bytes, resize) {
      onData = (b) => bytes(b);
      onResize = resize;
      keys.setRawMode?.(true);
      keys.on("data", onData);
      keys.resume();
      out.on("resize", onResize);
    },
    stop() {
      if (onData) keys.off("data", onData);
      if (onResize) out.off("resize", onResize);
      onData = undefined;
      onResize = undefined;
      keys.setRawMode?.(false);
      keys.pause();
      if (own) keys.destroy();
    },
  };
}
