import { describe, expect, it } from 'vitest';
import { sha256Hex } from '../../src/lib/evidence/hash';

describe('SHA-256 of inputs', () => {
	// FIPS 180-4 examples (NIST "SHA256.pdf" example values).
	it('matches the FIPS 180-4 one-block and two-block examples', () => {
		expect(sha256Hex('abc')).toBe(
			'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'
		);
		expect(sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe(
			'248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1'
		);
	});

	it('hashes bytes and their UTF-8 string alike, and the empty input to the standard value', () => {
		expect(sha256Hex(new TextEncoder().encode('Schmidt ≥ 3'))).toBe(sha256Hex('Schmidt ≥ 3'));
		expect(sha256Hex('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
	});
});
