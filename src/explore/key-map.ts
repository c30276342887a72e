import type { Key, KeyName } from "./keys.js";

/** What a key does while the tree is shown. */
export type Action =
  | "next"
  | "previous"
  | "parent"
  | "child"
  | "root"
  | "last"
  | "open"
  | "pin"
  | "unpin"
  | "clear"
  | "next-extra"
  | "previous-extra"
  | "search"
  | "next-match"
  | "previous-match"
  | "importance"
  | "undo"
  | "help"
  | "write"
  | "print"
  | "quit"
  | "interrupt"
  | "redraw";

export interface Binding {
  /** The keys, as the help writes them. */
  readonly label: string;
  readonly keys: readonly (KeyName | { char: string })[];
  readonly action: Action;
  readonly help: string;
}

/** Every key of the view, in the order the help lists them. The help is made from this table. */
export const KEY_MAP: readonly Binding[] = [
  { label: "Down / Up", keys: ["down"], action: "next", help: "focus the next / previous shown node" },
  { label: "", keys: ["up"], action: "previous", help: "" },
  { label: "Left", keys: ["left"], action: "parent", help: "focus the parent" },
  {
    label: "Right",
    keys: ["right"],
    action: "child",
    help: "focus the first child (the first shown, else the most interesting)",
  },
  { label: "Home / End", keys: ["home"], action: "root", help: "the root / the last shown node" },
  { label: "", keys: ["end"], action: "last", help: "" },
  {
    label: "Enter, o",
    keys: ["enter", { char: "o" }],
    action: "open",
    help: "open the fold on this line: its most interesting hidden children join the foci",
  },
  {
    label: "+",
    keys: [{ char: "+" }],
    action: "pin",
    help: "pin this node: it stays a focus when you move on",
  },
  {
    label: "-",
    keys: [{ char: "-" }],
    action: "unpin",
    help: "drop this node from the extra foci, else the last one added",
  },
  { label: "x", keys: [{ char: "x" }], action: "clear", help: "drop every extra focus" },
  {
    label: "Tab / Shift-Tab",
    keys: ["tab"],
    action: "next-extra",
    help: "go to the next / previous extra focus",
  },
  { label: "", keys: ["back-tab"], action: "previous-extra", help: "" },
  {
    label: "/",
    keys: [{ char: "/" }],
    action: "search",
    help: "search names as you type; with * or / a pattern (** any levels). Enter keeps, Esc goes back",
  },
  {
    label: "n / N",
    keys: [{ char: "n" }],
    action: "next-match",
    help: "next / previous match (in a diff, change, until you search)",
  },
  { label: "", keys: [{ char: "N" }], action: "previous-match", help: "" },
  { label: "i", keys: [{ char: "i" }], action: "importance", help: "importance: by depth, or by size" },
  { label: "u", keys: [{ char: "u" }], action: "undo", help: "undo" },
  {
    label: "h, F1",
    keys: [{ char: "h" }, "f1"],
    action: "help",
    help: "this help: the keys, then what the marks and numbers mean",
  },
  {
    label: "w",
    keys: [{ char: "w" }],
    action: "write",
    help: "write the foci to a file: *.yaml or *.yml updates a config file, any other name a --focus-from list",
  },
  {
    label: "p",
    keys: [{ char: "p" }],
    action: "print",
    help: "quit and print the espalier command line that shows this view",
  },
  { label: "q", keys: [{ char: "q" }], action: "quit", help: "quit" },
  { label: "Ctrl-C", keys: ["ctrl-c"], action: "interrupt", help: "quit (exit status 130)" },
  { label: "Ctrl-L", keys: ["ctrl-l"], action: "redraw", help: "draw the screen again" },
];

/** The action a key stands for while the tree is shown, or null. */
export function actionOf(key: Key): Action | null {
  for (const binding of KEY_MAP)
    for (const k of binding.keys) {
      if (typeof k === "string" ? "name" in key && key.name === k : "char" in key && key.char === k.char)
        return binding.action;
    }
  return null;
}

/** The help's rows: each key (or pair of keys, written once) and what it does. */
export function helpEntries(): { keys: string; does: string }[] {
  return KEY_MAP.filter((b) => b.label !== "").map((b) => ({ keys: b.label, does: b.help }));
}
