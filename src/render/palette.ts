import { Chalk, type ChalkInstance } from "chalk";

/** The few styles the text rendering uses; identity functions when colour is off. */
export interface Palette {
  focus: (s: string) => string;
  path: (s: string) => string;
  quiet: (s: string) => string;
}

const plain = (s: string) => s;
export const noColour: Palette = { focus: plain, path: plain, quiet: plain };

/** Colour is decided at the edge (terminal, NO_COLOR, --color) and handed in as a boolean. */
export function palette(colour: boolean): Palette {
  if (!colour) return noColour;
  const c: ChalkInstance = new Chalk({ level: 1 });
  return { focus: (s) => c.bold.yellow(s), path: (s) => c.bold(s), quiet: (s) => c.dim(s) };
}
