/** The masked form of an address shown to someone who may not own it (access/masked-address.ts). */
import { describe, expect, it } from 'vitest';
import { maskedAddress } from '../../src/lib/server/access/masked-address';

describe('maskedAddress', () => {
	it('keeps the first letters and the last domain label only', () => {
		expect(maskedAddress('tor@basalt.example')).toBe('t***@b***.example');
		expect(maskedAddress('jo.vik@mail.uni.example.edu')).toBe('j***@m***.edu');
		expect(maskedAddress('a@x.io')).toBe('a***@x***.io');
	});

	it('does not tell the length of what it hides', () => {
		expect(maskedAddress('ab@cd.org')).toBe(maskedAddress('abcdefgh@cdefghij.org'));
	});
});
