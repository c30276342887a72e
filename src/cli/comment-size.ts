import { formatCount } from "../render/amount.js";

/**
 * Most characters a pull-request comment holds on GitHub: 65,536 (common practice, no source). A
 * Markdown summary or diff is meant for one, and its budget bounds its lines, not their length (long
 * edited values on many fields): past this it would be refused where it is posted.
 */
export const COMMENT_LIMIT = 65_536;

/** The warning for standard error when `--format markdown` output is longer than a comment holds; none otherwise. */
export function commentSizeNote(format: string | undefined, text: string): string | undefined {
  if (format !== "markdown" || text.length <= COMMENT_LIMIT) return undefined;
  let chars = 0;
  for (const _ of text) chars++;
  if (chars <= COMMENT_LIMIT) return undefined;
  return (
    `espalier: warning: the Markdown is ${formatCount(chars)} characters, more than the ${formatCount(COMMENT_LIMIT)} ` +
    "a pull-request comment on GitHub holds: a smaller --budget, or fewer --compare-field, makes it shorter\n"
  );
}
