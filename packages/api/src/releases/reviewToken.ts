/**
 * Review-link tokens, in the selector/validator pattern. The e-mailed token is
 * `<selector>.<secret>`: a 12-character random selector (9 bytes) that finds the row, and a secret
 * of 32 random bytes (crypto.randomBytes, base64url). The database keeps only
 *   tokenHash = SHA-256(secret ‖ selector ‖ releaseId ‖ reviewerId ‖ manifestSha256),
 * so a copy of the table yields no usable link, and the hash binds the link to its reviewer and to
 * the exact release content: a row edited to point elsewhere no longer matches (refused as tampered).
 * The comparison is constant-time (timingSafeEqual).
 */
import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

export const TOKEN_SECRET_BYTES = 32;
export const TOKEN_SELECTOR_BYTES = 9;
const TOKEN_FORMAT = /^([A-Za-z0-9_-]{12})\.([A-Za-z0-9_-]{43})$/;

export interface TokenBinding {
  readonly selector: string;
  readonly releaseId: number;
  readonly reviewerId: number;
  readonly manifestSha256: string;
}

export interface IssuedToken {
  readonly token: string;
  readonly selector: string;
  readonly tokenHash: string;
}

export function issueToken(binding: Omit<TokenBinding, 'selector'>): IssuedToken {
  const selector = randomBytes(TOKEN_SELECTOR_BYTES).toString('base64url');
  const secret = randomBytes(TOKEN_SECRET_BYTES).toString('base64url');
  return { token: `${selector}.${secret}`, selector, tokenHash: tokenHash(secret, { ...binding, selector }) };
}

/** Selector and secret of a token, or null when it is not of the issued shape. */
export function parseToken(token: string): { selector: string; secret: string } | null {
  const m = TOKEN_FORMAT.exec(token);
  return m?.[1] && m[2] ? { selector: m[1], secret: m[2] } : null;
}

export function tokenHash(secret: string, b: TokenBinding): string {
  return createHash('sha256')
    .update(`${secret}\u0000${b.selector}\u0000${b.releaseId}\u0000${b.reviewerId}\u0000${b.manifestSha256}`)
    .digest('hex');
}

export function tokenMatches(secret: string, binding: TokenBinding, storedHash: string): boolean {
  const expected = Buffer.from(tokenHash(secret, binding), 'hex');
  const stored = Buffer.from(storedHash, 'hex');
  return stored.length === expected.length && timingSafeEqual(stored, expected);
}
