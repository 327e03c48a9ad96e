/**
 * The keyed hash of a hospital's own patient identifier, used only to detect the same patient
 * or case entered twice. The identifier is normalised (Unicode NFKC, trimmed, upper case), then
 * HMAC-SHA-256 is taken over the site id and the identifier with the secret from configuration
 * (IDENTIFIER_HASH_SECRET). Only the hex digest is stored; the identifier is never stored,
 * logged or echoed. Keyed with the site, the same number at two hospitals gives two hashes.
 *
 * HMAC: RFC 2104; SHA-256: FIPS 180-4.
 */
import { createHmac } from 'node:crypto';

/** Trim and fold case (and compatibility forms, e.g. full-width digits) so "ab 12 " = "AB 12". */
export function normaliseIdentifier(raw: string): string {
  return raw.normalize('NFKC').trim().toUpperCase();
}

/** The stored keyed hash: hex HMAC-SHA-256 of `siteId` + U+001F + the normalised identifier. */
export function identifierHash(secret: string, siteId: string, rawIdentifier: string): string {
  const id = normaliseIdentifier(rawIdentifier);
  if (!id) throw new Error('identifierHash: the identifier is empty after trimming');
  return createHmac('sha256', secret).update(`${siteId}\u001f${id}`, 'utf8').digest('hex');
}
