/**
 * The key's lines of a printed screen: from the line starting `key: ` to the root's line (the first
 * that starts with a mark, or a level in digits and a mark); none without a key line. The key takes
 * as many lines as its screen needs (see `keyRowsNeeded`), so tests read it whole.
 */
export function keyBlock(lines: readonly string[]): string[] {
  const at = lines.findIndex((l) => l.startsWith("key: "));
  if (at < 0) return [];
  const root = lines.findIndex((l, k) => k > at && /^(\d+ )?[*:.&] /.test(l));
  return lines.slice(at, root < 0 ? lines.length : root);
}
