// The five characters with predefined entities (XML 1.0, section 4.6), escaped in text and in
// attribute values alike so one function serves both.
const SPECIAL = /[&<>"']/g;
const ENTITY: Record<string, string> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&apos;",
};

// Code points that XML 1.0 does not allow in a document at all (section 2.2, production [2]): C0
// controls other than tab, line feed and carriage return, lone surrogates, U+FFFE and U+FFFF. Names
// reach here through safeText, which already turns controls into visible escapes.
const NOT_XML =
  /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

// A line that begins (after blanks) with "::" or "##" is a command to some CI runners (common practice,
// no source: GitHub Actions "::", Azure Pipelines "##vso[" and "##["). Text with line breaks (a
// tooltip) puts its own lines in the file; their first character is written as a character reference,
// which an SVG viewer shows as the character itself.
const LINE_START_COMMAND = /(^|\n)([ \t]*)([:#])(?=[:#])/g;

/**
 * Text made literal inside XML character data or a quoted attribute value: no markup can survive, and
 * no line of it can start with a CI runner's command prefix.
 */
export function xmlEscape(text: string): string {
  return text
    .replace(NOT_XML, "\uFFFD")
    .replace(SPECIAL, (ch) => ENTITY[ch])
    .replace(
      LINE_START_COMMAND,
      (_m, br: string, blanks: string, ch: string) => `${br}${blanks}&#${ch.charCodeAt(0)};`,
    );
}
