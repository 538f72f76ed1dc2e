import { createHash, randomBytes } from 'node:crypto';

/** A random secret with a readable prefix, e.g. "eyr_…" for API tokens. */
export function newSecret(prefix: string): string {
  return `${prefix}${randomBytes(32).toString('base64url')}`;
}

/**
 * Secrets here carry 256 random bits, so a fast hash is enough: there is no
 * dictionary to guess from. Only this hash is stored.
 */
export function hashSecret(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}
