/**
 * What a size text that is not a number probably is, for the end of a BAD_SIZE message: "" when
 * nothing is recognised. Only the shape of the text is described, never the text itself (a message
 * quotes input through `quoted`, so `--pseudonymize` can hide it).
 */
/** How a git repository lists sizes and paths as espalier reads them (git 2.36 and later: `--format`). */
const GIT_SIZES = "list sizes and paths with git ls-tree -r --format='%(objectsize)%x09%(path)' HEAD";

export function sizeTextHint(text: string): string {
  const s = text.trim();
  // Digit groups of three after the first (common practice, no source): "1,200" or "1.200.300".
  if (/^\d{1,3}(?:,\d{3})+(?:\.\d+)?$/.test(s) || /^\d{1,3}(?:\.\d{3}){2,}$/.test(s))
    return "; write it without thousands separators";
  // A number with a unit, as `du -h`, `ls -lh` and spreadsheets print sizes (common practice, no source).
  if (/^\d+(?:[.,]\d+)?\s*(?:[kKMGTPE](?:i?B)?|B|bytes?)$/.test(s))
    return "; sizes are plain numbers (bytes for files): `du -h` and `ls -lh` print rounded sizes with units, `du -ab` and `find -printf '%s'` print bytes";
  // A git listing's fields before the tab (git 2.39 here): `git ls-tree -l` gives mode, type, hash and
  // size; `git ls-tree` without -l no size; `git ls-files -s` mode, hash and stage (0 to 3), no size,
  // so the number it ends with is no size to keep.
  if (/^[0-7]{6} (?:blob|tree|commit) [0-9a-f]{40,64}(?: +(?:\d+|-))?$/.test(s))
    return `; it is a \`git ls-tree${/\d$|-$/.test(s) ? " -l" : ""}\` line (mode, type, hash${/\d$|-$/.test(s) ? " and size" : ""}): ${GIT_SIZES}`;
  if (/^[0-7]{6} [0-9a-f]{40,64} [0-3]$/.test(s))
    return `; it is a \`git ls-files -s\` line (mode, hash and stage, which is no size): ${GIT_SIZES}, or the paths alone with git ls-files`;
  // Several words ending in a number: more fields than the size before the separator.
  if (/\s/.test(s) && /(?:^|\s)\d+$/.test(s))
    return "; it holds several fields ending in a number: keep only the size before the separator (a `git ls-tree -l` line, for one, has its mode, type and hash before the size)";
  return "";
}
