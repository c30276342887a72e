/**
 * The names of `names` that occur in `text`. One assertion on this list replaces one `expect` per name:
 * a few thousand expects cost seconds on a loaded machine, a plain scan costs milliseconds.
 */
export function leakedNames(text: string, names: Iterable<string>): string[] {
  const found: string[] = [];
  for (const name of names) if (text.includes(name)) found.push(name);
  return found;
}
