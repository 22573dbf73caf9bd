import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { sha256Text } from '../../src/core/sha256.js';

describe('SHA-256 in plain TypeScript (the design page hashes the scenario it saves)', () => {
  it('gives the digests of the standard\'s examples (FIPS 180-2, appendix B: "abc" and the 448-bit message)', () => {
    expect(sha256Text('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(sha256Text('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
    expect(sha256Text('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('agrees with node:crypto (a reference implementation) at every padding boundary and on multi-byte UTF-8', () => {
    const texts = [55, 56, 63, 64, 65, 119, 120, 1000].map((n) => 'x'.repeat(n));
    texts.push('250 µF, 12 kV, Ω, 𝄞 \u2028 end', JSON.stringify({ name: 'Bay 4 staggered bank', bank: [{ voltage: '10 kV' }] }, null, 2));
    for (const text of texts) expect(sha256Text(text), text.slice(0, 20)).toBe(createHash('sha256').update(text).digest('hex'));
  });
});
