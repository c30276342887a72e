/** The largest size, and the largest total, espalier accepts: 2^53 − 1 (ECMA-262 Number.MAX_SAFE_INTEGER). */
export const MAX_SIZE = Number.MAX_SAFE_INTEGER;

/**
 * Whether a number is a size: from 0 to 2^53 - 1. Beyond that a double no longer holds every whole
 * number, so totals could be silently rounded; NaN and infinities are no sizes. Every loader rejects
 * anything else with BAD_SIZE at the size's position, and {@link checkSizes} guards every tree built.
 */
export function isSize(value: number): boolean {
  return value >= 0 && value <= MAX_SIZE;
}
