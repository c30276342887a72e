import { createHmac } from "node:crypto";

/**
 * A stable pseudonym for a name: the first 12 hex digits of HMAC-SHA-256(secret, name) (RFC 2104,
 * FIPS 180-4). The same secret gives the same pseudonym in every run, so outputs stay diffable;
 * without the secret the name cannot be recomputed from a guess list.
 */
export function pseudonym(secret: string, name: string): string {
  return `anon-${createHmac("sha256", secret).update(name, "utf8").digest("hex").slice(0, 12)}`;
}
