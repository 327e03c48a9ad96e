// The keyed hash: HMAC (RFC 2104) with SHA-256 (FIPS 180-4). The primitive is checked against
// RFC 4231 test case 2 through Web Crypto, then identifierHash against that same independent path.
import { describe, expect, it } from 'vitest';
import { identifierHash, normaliseIdentifier } from '../../../server/registry/identifier-hash.js';

async function webCryptoHmac(key: string, message: string): Promise<string> {
  const k = await crypto.subtle.importKey('raw', new TextEncoder().encode(key), { name: 'HMAC', hash: 'SHA-256' }, false, ['sign']);
  const sig = await crypto.subtle.sign('HMAC', k, new TextEncoder().encode(message));
  return Buffer.from(sig).toString('hex');
}

describe('identifier keyed hash', () => {
  it('when Web Crypto computes RFC 4231 test case 2, then it gives the published HMAC-SHA-256', async () => {
    // RFC 4231 section 4.3: key "Jefe", data "what do ya want for nothing?".
    expect(await webCryptoHmac('Jefe', 'what do ya want for nothing?')).toBe('5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843');
  });

  it('when an identifier is hashed, then it equals HMAC-SHA-256(secret, siteId + U+001F + trimmed upper-case identifier)', async () => {
    const secret = 'a-test-secret-of-at-least-thirty-two-chars';
    const site = '3f1c2a4e-8b7d-4c6e-9a1b-2d3e4f5a6b7c';
    expect(identifierHash(secret, site, '  ab-123 ')).toBe(await webCryptoHmac(secret, `${site}\u001fAB-123`));
  });

  it('when the same identifier differs only in spacing at the ends, case or full-width digits, then the hash is the same', () => {
    const s = 'a-test-secret-of-at-least-thirty-two-chars';
    const site = '3f1c2a4e-8b7d-4c6e-9a1b-2d3e4f5a6b7c';
    // NFKC maps full-width digits (U+FF11...) to ASCII digits (Unicode Standard Annex #15).
    expect(normaliseIdentifier(' ab\uFF11\uFF12 ')).toBe('AB12');
    expect(identifierHash(s, site, 'ab12')).toBe(identifierHash(s, site, ' AB12\t'));
    expect(identifierHash(s, site, 'ab12')).not.toBe(identifierHash(s, '00000000-0000-4000-8000-000000000000', 'ab12'));
    expect(identifierHash(s, site, 'ab12')).not.toBe(identifierHash(`${s}x`, site, 'ab12'));
  });

  it('when the identifier is blank after trimming, then it throws rather than hashing nothing', () => {
    expect(() => identifierHash('a-test-secret-of-at-least-thirty-two-chars', 'site', '   ')).toThrow(/empty/);
  });
});
