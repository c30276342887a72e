import { EspalierError } from "../errors.js";
import type { CliIO } from "./io.js";

/**
 * Reads a named input ("-" is standard input) and decodes it as UTF-8. A byte-order mark is dropped;
 * bytes that are not valid UTF-8 become U+FFFD (the WHATWG decoder's replacement behaviour).
 */
export async function readInput(io: CliIO, name: string): Promise<string> {
  let bytes: Buffer;
  try {
    bytes = name === "-" ? await io.readStdin() : await io.readFile(name);
  } catch (err) {
    const reason = (err as NodeJS.ErrnoException).code ?? (err as Error).message;
    throw new EspalierError("IO", `cannot read ${name === "-" ? "standard input" : name}: ${reason}`, {
      file: name,
    });
  }
  return new TextDecoder("utf-8", { ignoreBOM: false }).decode(bytes);
}
