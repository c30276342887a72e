import { open } from "node:fs/promises";
import { EspalierError } from "../../errors.js";
import { readLimits } from "../read-limits.js";
import { CsvScanner } from "../table/csv-scanner.js";

const CHUNK = 1 << 16;

/**
 * The header row's names of a CSV or TSV file, read with espalier's own scanner (CsvScanner: RFC 4180
 * quoting for CSV, none for TSV) from the file's first bytes, as many chunks as the first record takes
 * (at most `maxRecordBytes`). The engine is then told these names rather than guessing them. The header
 * must be the file's first line (after a byte order mark): the engine takes line 1 as the header, so a
 * leading empty line would make it read the header row as facts.
 */
export async function readHeader(
  file: string,
  delimiter: "," | "\t",
  maxRecordBytes: number = readLimits.maxLineBytes,
): Promise<string[]> {
  const handle = await open(file).catch((err: NodeJS.ErrnoException) => {
    throw new EspalierError("IO", `cannot read ${file}: ${err.code ?? err.message}`, { file });
  });
  const decoder = new TextDecoder("utf-8");
  const names: string[] = [];
  let headerLine = 0;
  const scanner = new CsvScanner(
    delimiter.charCodeAt(0),
    {
      field(column, bytes, start, end) {
        names[column] = decoder.decode(bytes.subarray(start, end));
      },
      record(fields, line) {
        names.length = fields;
        headerLine = line;
        return true;
      },
    },
    maxRecordBytes,
  );
  try {
    const buffer = new Uint8Array(CHUNK);
    let position = 0;
    while (!scanner.done) {
      const { bytesRead } = await handle.read(buffer, 0, CHUNK, position);
      if (bytesRead === 0) break;
      position += bytesRead;
      scanner.write(buffer.subarray(0, bytesRead));
    }
    scanner.end();
  } finally {
    await handle.close();
  }
  if (headerLine === 0) throw new EspalierError("INPUT_EMPTY", "the input is empty");
  if (headerLine !== 1)
    throw new EspalierError("PARSE_CSV", "the first line is empty where the header row belongs", {
      line: 1,
    });
  return names;
}
