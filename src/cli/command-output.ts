/** What a command hands back: the text for standard output and the exit code. */
export interface CommandOutput {
  text: string;
  exitCode: number;
}
