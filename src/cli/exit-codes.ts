/** The one place exit codes are chosen. */
export const EXIT = {
  /** Success. */
  ok: 0,
  /** `diff --fail-on-change` found differences (the POSIX convention of comparison utilities). */
  differences: 1,
  /** A usage or input error; nothing was written to standard output. */
  error: 2,
  /** `explore` left with Ctrl-C or a signal (the shell convention: 128 + SIGINT). */
  interrupted: 130,
} as const;
