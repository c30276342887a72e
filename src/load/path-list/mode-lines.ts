/**
 * How a line that starts with a file's mode is laid out: as GNU tar and busybox tar tv print it (`tar`:
 * a mode, owner/group, the size, a date and a time, then the name; seen here, GNU tar 1.34
 * `-rw-r--r-- 0/0   1077 1985-10-26 08:15 package/LICENSE` and busybox 1.35, which adds the seconds),
 * as `ls -l` and bsdtar tv print it (`ls`: a mode, links, owner, group, the size, month, day, and a
 * time or a year; seen here, bsdtar 3.6.2 `-rw-r--r--  0 root   root     3000 Dec  4 21:11 pkg/a.js`,
 * GNU ls in the C locale alike), or neither.
 */
export function modeLineShape(text: string): "tar" | "ls" | undefined {
  if (TAR_LINE.test(text)) return "tar";
  return LS_LINE.test(text) ? "ls" : undefined;
}

const TAR_LINE =
  /^\S{10,11} +\S+\/\S+ +[0-9]+ +[0-9]{4}-[0-9]{2}-[0-9]{2} +[0-9]{2}:[0-9]{2}(:[0-9]{2})? +\S/;
const LS_LINE =
  /^\S{10,11} +[0-9]+ +\S+ +\S+ +[0-9]+ +[A-Z][a-z]{2} +[0-9]{1,2} +(?:[0-9]{1,2}:[0-9]{2}|[0-9]{4}) +\S/;

/**
 * The way out for a `tar` layout: its sizes and names as a path list, read by awk (mawk and gawk); a
 * symbolic link's ` -> target` is dropped from its name.
 */
export const TAR_LINES =
  "every line starts with a file's mode (-rw-r--r--), as GNU tar and busybox tar tv print: read as a path list, each whole line would be one path, its size and date part of the names. Keep the size and the name as a path list: tar tvf FILE | awk '{s = $3; l = ($1 ~ /^l/); sub(/^[^ ]+ +[^ ]+ +[^ ]+ +[^ ]+ +[^ ]+ +/, \"\"); if (l) sub(/ -> .*$/, \"\"); print s \"\\t\" $0}' | espalier - (this awk reads GNU tar's and busybox's columns, not bsdtar's); to read each line as a path, pass --input-format paths";

/**
 * The way out for an `ls` layout: bsdtar tv's sizes and names as a path list (`total N`, which ls -l
 * prints first, skipped); ls -l lists one folder's names without a path, so find is named for it.
 */
export const LS_LINES =
  'every line starts with a file\'s mode (-rw-r--r--), as ls -l and bsdtar tv (tar tv on BSD and macOS) print: read as a path list, each whole line would be one path, its size and date part of the names. For an archive, keep the size and the name as a path list: bsdtar tvf FILE | awk \'$1 == "total" && NF == 2 {next} {s = $5; l = ($1 ~ /^l/); sub(/^[^ ]+ +[^ ]+ +[^ ]+ +[^ ]+ +[^ ]+ +[^ ]+ +[^ ]+ +[^ ]+ +/, ""); if (l) sub(/ -> .*$/, ""); print s "\\t" $0}\' | espalier -; for a folder, list sizes and paths: find DIR -printf \'%s\\t%p\\n\'; to read each line as a path, pass --input-format paths';

export const MODES_FIRST =
  "every line starts with a file's mode (-rw-r--r--), as ls -l and tar tv print: read as a path list, each whole line would be one path, its size and date part of the names. List paths instead: find DIR -printf '%s\\t%p\\n' (sizes and paths), tar tf (names); to read each line as a path, pass --input-format paths";
