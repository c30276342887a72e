import { EspalierError, formatPos } from "../errors.js";
import { safeText } from "../model/safe-text.js";

/** The single line printed on standard error for an error: position, message, code. No stack trace. */
export function formatError(err: unknown): string {
  if (err instanceof EspalierError) {
    const where = formatPos(err.pos);
    return `espalier: ${where ? `${safeText(where, 400)}: ` : ""}${safeText(err.message, 2000)} [${err.code}]\n`;
  }
  const message = err instanceof Error ? err.message : String(err);
  return `espalier: internal error: ${safeText(message, 2000)} [INTERNAL]\n`;
}
