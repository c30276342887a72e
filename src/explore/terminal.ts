// The control sequences the view writes, as plain strings (the edge writes them).
// ECMA-48 (5th edition, 1991): CSI is ESC [ (5.3, 7-bit code); CUP (8.3.21), ED (8.3.39), EL (8.3.41),
// SGR (8.3.117). The private modes are DEC's as xterm documents them ("Xterm Control Sequences", DECSET /
// DECRST): ?25 shows or hides the cursor (DECTCEM), ?1049 saves the cursor and switches to the alternate
// screen buffer, clearing it (and back, restoring the cursor).

const CSI = "\u001b[";

/** Enter the alternate screen (saving the cursor), hide the cursor. */
export const ENTER = `${CSI}?1049h${CSI}?25l`;

/** Show the cursor, leave the alternate screen (restoring the cursor and what was on the screen). */
export const LEAVE = `${CSI}?25h${CSI}?1049l`;

/** Cursor to row 1, column 1 (CUP with default parameters). */
export const HOME = `${CSI}H`;

/** Erase from the cursor to the end of the line (EL, parameter 0). */
export const ERASE_LINE = `${CSI}K`;

/** Erase from the cursor to the end of the screen (ED, parameter 0). */
export const ERASE_BELOW = `${CSI}J`;

/** SGR 7 (negative image) and 27 (positive image): the cursor's row and the status bar, in colour mode. */
export const INVERSE = `${CSI}7m`;
export const INVERSE_OFF = `${CSI}27m`;

/**
 * One whole frame: from the top-left corner, every row followed by an erase to its end (so a shorter
 * row leaves nothing of the one before), the rest of the screen erased. One write, so no half frame
 * ever shows.
 */
export function frame(rows: readonly string[]): string {
  return `${HOME}${rows.map((row) => `${row}${ERASE_LINE}`).join("\r\n")}${ERASE_BELOW}`;
}
