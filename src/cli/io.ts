/** Everything the CLI touches outside itself, passed in so tests drive it directly. */
export interface CliIO {
  stdout: { write(text: string): unknown; isTTY?: boolean; rows?: number; columns?: number };
  stderr: { write(text: string): unknown; isTTY?: boolean };
  /** Reads standard input whole. */
  readStdin(): Promise<Buffer>;
  readFile(path: string): Promise<Buffer>;
  env: Record<string, string | undefined>;
}
