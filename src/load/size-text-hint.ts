/**
 * What a size text that is not a number probably is, for the end of a BAD_SIZE message: "" when
 * nothing is recognised. Only the shape of the text is described, never the text itself (a message
 * quotes input through `quoted`, so `--pseudonymize` can hide it).
 */
export function sizeTextHint(text: string): string {
  const s = text.trim();
  // Digit groups of three after the first (common practice, no source): "1,200" or "1.200.300".
  if (/^\d{1,3}(?:,\d{3})+(?:\.\d+)?$/.test(s) || /^\d{1,3}(?:\.\d{3}){2,}$/.test(s))
    return "; write it without thousands separators";
  // A number with a unit, as `du -h`, `ls -lh` and spreadsheets print sizes (common practice, no source).
  if (/^\d+(?:[.,]\d+)?\s*(?:[kKMGTPE](?:i?B)?|B|bytes?)$/.test(s))
    return "; sizes are plain numbers (bytes for files): `du -h` and `ls -lh` print rounded sizes with units, `du -ab` and `find -printf '%s'` print bytes";
  // Several words ending in a number: more fields than the size before the separator.
  if (/\s/.test(s) && /(?:^|\s)\d+$/.test(s))
    return "; it holds several fields ending in a number: keep only the size before the separator (a `git ls-tree -l` line, for one, has its mode, type and hash before the size)";
  return "";
}
