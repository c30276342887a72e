// Characters a POSIX shell reads literally outside quotes (POSIX.1-2017, XCU 2.2 Quoting: everything
// else is either special or, like a space, a separator), taken narrowly.
const PLAIN = /^[A-Za-z0-9_@%+=:,./-]+$/;
// What must not reach a terminal or a log as itself: C0 and C1 controls, DEL, the line and paragraph
// separators and the bidirectional controls (the same set render/escape.ts makes visible).
const UNSAFE = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/u;

/**
 * One argument quoted for a POSIX shell: as is when plain, in single quotes otherwise (a quote inside
 * is written '\''), and in dollar-single-quotes with \xHH escapes when it holds a control or bidi
 * character (POSIX.1-2024, XCU 2.2.4), so the printed line never carries a raw control character.
 */
export function shellQuote(arg: string): string {
  if (PLAIN.test(arg)) return arg;
  if (!UNSAFE.test(arg)) return `'${arg.replace(/'/g, "'\\''")}'`;
  let out = "";
  for (const ch of arg) {
    if (ch === "\\" || ch === "'") out += `\\${ch}`;
    else if (UNSAFE.test(ch))
      for (const b of Buffer.from(ch, "utf8")) out += `\\x${b.toString(16).padStart(2, "0")}`;
    else out += ch;
  }
  return `$'${out}'`;
}

/**
 * The command line that prints the view: `head` (the program, the inputs and the options that shape the
 * tree and its labels, as arguments), then one `--focus` per focus path, the budget, and `--bare` when
 * the view shows no header line. A screen that starts with its header and key prints as the CLI's
 * output does (same rows, the key's pointer to more aside: the view's help is `h`).
 */
export function commandLine(
  head: readonly string[],
  fociPaths: readonly string[],
  budget: number,
  tail: readonly string[] = [],
  bare = true,
): string {
  const args = [...head];
  for (const path of fociPaths) args.push("--focus", path);
  // Without a header line on the screen, --bare makes the printed command spend its budget on the same
  // tree; with one, the header and key are the CLI's own.
  args.push("--budget", String(budget), ...(bare ? ["--bare"] : []), ...tail);
  return args.map(shellQuote).join(" ");
}
