/**
 * Calls one of `node:fs`'s callback functions and gives its result as a promise. The command line's
 * own reads go through these rather than `node:fs/promises`, a module a start would otherwise load
 * and compile for a handful of calls (start-up, issue 14).
 */
export function fsCall<T>(fn: (...args: never[]) => void, ...args: unknown[]): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const done = (error: Error | null, value: T) => (error ? reject(error) : resolve(value));
    (fn as (...all: unknown[]) => void)(...args, done);
  });
}
