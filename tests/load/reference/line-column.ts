/** 1-based line and column (in UTF-16 units) of `offset` in `text`. "\n" ends a line, so "\r\n" does too. */
export function lineColumnAt(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let start = 0;
  for (let i = text.indexOf("\n"); i !== -1 && i < offset; i = text.indexOf("\n", i + 1)) {
    line++;
    start = i + 1;
  }
  return { line, column: offset - start + 1 };
}
